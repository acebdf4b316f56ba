export { streamSeed } from './stream-seed';
export { Xoshiro128, XOSHIRO_NEXT_SOURCE } from './xoshiro128';
export {
  buildZigguratTables,
  normalFrom,
  normalDrawSource,
  fastNormalDrawSource,
  normalSlowPathSource,
  ZIGGURAT_FAST_TABLE,
  ZIGGURAT_TABLES,
  type ZigguratTables,
} from './ziggurat';
