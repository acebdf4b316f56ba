/** Every table, for Drizzle's typed client. drizzle-kit finds them itself through the *.table.ts glob. */
export * from '../users/users.table';
export * from '../auth/sessions.table';
export * from '../auth/password-resets.table';
export * from '../auth/rate-limits.table';
export * from '../auth/sign-up-requests.table';
export * from '../sheets/sheets.table';
export * from '../shares/shares.table';
export * from '../comments/comments.table';
export * from '../datasets/datasets.table';
