-- Hand-written (drizzle-kit generate --custom). Sessions are now stored as the SHA-256 of their
-- token; rows written before hold the token itself, which no cookie can match any more and which
-- would open a session to whoever reads the table. End them all: everyone signs in again once.
DELETE FROM "sessions";
