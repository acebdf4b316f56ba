import { FunctionBody } from './emitter';
import { F64, I32, OP } from './opcodes';
import { emitExp, emitLog } from './fdlibm';
import { FN_OFFSET, TABLE_OFFSET } from './memory-layout';

/**
 * The ziggurat's rare branch in wasm, scalar, for one lane: the same steps as `normalSlowPath`
 * (random/ziggurat.ts) on the lane's generator state in the i32 locals zg0…zg3, with the same
 * tables (wn and kn² in the pair table, fn at FN_OFFSET) and the fdlibm ports of exp and log, so
 * it gives the same bits and leaves the generator where the JavaScript kernel leaves it.
 */
const ZIGGURAT_R = 3.442619855899;
const OPEN_UNIT_SCALE = 2.3283064365386963e-10;

/** One xoshiro128** step on zg0…zg3, the output in zr. */
function next(f: FunctionBody): void {
  f.get('zg1').i32(5).op(OP.i32Mul).i32(7).op(OP.i32Rotl).i32(9).op(OP.i32Mul).set('zr');
  f.get('zg1').i32(9).op(OP.i32Shl).set('zt');
  f.get('zg2').get('zg0').op(OP.i32Xor).set('zg2');
  f.get('zg3').get('zg1').op(OP.i32Xor).set('zg3');
  f.get('zg1').get('zg2').op(OP.i32Xor).set('zg1');
  f.get('zg0').get('zg3').op(OP.i32Xor).set('zg0');
  f.get('zg2').get('zt').op(OP.i32Xor).set('zg2');
  f.get('zg3').i32(11).op(OP.i32Rotl).set('zg3');
}

/** ((next >>> 0) + 0.5) · 2^-32, into `into`. */
function openUnit(f: FunctionBody, into: string): void {
  next(f);
  f.get('zr').op(OP.f64ConvertI32U).f64(0.5).op(OP.f64Add).f64(OPEN_UNIT_SCALE).op(OP.f64Mul).set(into);
}

/** Declares the locals the rare branch uses. */
export function declareSlowNormalLocals(f: FunctionBody): void {
  for (const name of ['zg0', 'zg1', 'zg2', 'zg3', 'zr', 'zt', 'zhz', 'ziz']) f.local(name, I32);
  for (const name of ['zx', 'zu', 'zy', 'ztail', 'zv', 'zout']) f.local(name, F64);
}

/**
 * zout = the normal draw finished from a first output zhz (whose fast test failed), with
 * ziz = zhz & 127, on the generator zg0…zg3.
 */
export function emitSlowNormal(f: FunctionBody): void {
  const wn = (): void => void f.get('ziz').i32(16).op(OP.i32Mul).load(OP.f64Load, 3, TABLE_OFFSET);
  const kn2 = (): void =>
    void f
      .get('ziz')
      .i32(16)
      .op(OP.i32Mul)
      .load(OP.f64Load, 3, TABLE_OFFSET + 8);
  const fn = (delta: number): void =>
    void f
      .get('ziz')
      .i32(8)
      .op(OP.i32Mul)
      .load(OP.f64Load, 3, FN_OFFSET + 8 * delta);
  f.block('zig', () => {
    f.loop('zigLoop', () => {
      f.get('zhz').op(OP.f64ConvertI32S);
      wn();
      f.op(OP.f64Mul).set('zx');
      f.get('ziz').op(OP.i32Eqz);
      f.if(() => {
        // Tail beyond r (Marsaglia 1964).
        f.loop('tail', () => {
          openUnit(f, 'zu');
          emitLog(f, 'zu', 'zv');
          f.get('zv').op(OP.f64Neg).f64(ZIGGURAT_R).op(OP.f64Div).set('ztail');
          openUnit(f, 'zu');
          emitLog(f, 'zu', 'zv');
          f.get('zv').op(OP.f64Neg).set('zy');
          f.get('zy').get('zy').op(OP.f64Add).get('ztail').get('ztail').op(OP.f64Mul).op(OP.f64Lt);
          f.brIf('tail');
        });
        f.get('zhz').i32(0).op(OP.i32GtS);
        f.if(
          () => f.f64(ZIGGURAT_R).get('ztail').op(OP.f64Add),
          () => f.f64(-ZIGGURAT_R).get('ztail').op(OP.f64Sub),
          F64,
        );
        f.set('zout').br('zig');
      });
      // fn[iz] + u·(fn[iz − 1] − fn[iz]) < exp(−0.5·x·x)
      fn(0);
      openUnit(f, 'zu');
      f.get('zu');
      fn(-1);
      fn(0);
      f.op(OP.f64Sub).op(OP.f64Mul).op(OP.f64Add).set('zu');
      f.f64(-0.5).get('zx').op(OP.f64Mul).get('zx').op(OP.f64Mul).set('zy');
      emitExp(f, 'zy', 'zv');
      f.get('zu').get('zv').op(OP.f64Lt);
      f.if(() => f.get('zx').set('zout').br('zig'));
      next(f);
      f.get('zr').set('zhz');
      f.get('zhz').i32(127).op(OP.i32And).set('ziz');
      f.get('zhz').op(OP.f64ConvertI32S).set('zx');
      f.get('zx').get('zx').op(OP.f64Mul);
      kn2();
      f.op(OP.f64Lt);
      f.if(() => {
        f.get('zx');
        wn();
        f.op(OP.f64Mul).set('zout').br('zig');
      });
      f.br('zigLoop');
    });
  });
}

/**
 * finish(lanes, draw): the draws of the lanes in `lanes` (bits), which reached the base layer's
 * tail, finished one lane at a time by the rare branch from their first output. The lanes'
 * generator state is the group's four i32x4 at `generatorOffset` (word w of lane l at
 * +16·w + 4·l), their first outputs at `firstOutputOffset`, and lane l's draw goes to
 * `draw` + 8·l. Every other lane is settled on four lanes in the hot loop (draw-wasm.ts).
 */
export function finishLanes(generatorOffset: number, firstOutputOffset: number): FunctionBody {
  const f = new FunctionBody(
    [
      ['lanes', I32],
      ['draw', I32],
    ],
    [],
  );
  declareSlowNormalLocals(f);
  f.local('a', I32);
  f.local('j', I32);
  f.loop('next', () => {
    // The lowest lane still to finish; clear its bit.
    f.get('lanes').op(OP.i32Ctz).set('a');
    f.get('lanes').get('lanes').i32(1).op(OP.i32Sub).op(OP.i32And).set('lanes');
    f.get('a').i32(4).op(OP.i32Mul).set('j');
    for (let w = 0; w < 4; w++)
      f.get('j')
        .load(OP.i32Load, 2, generatorOffset + 16 * w)
        .set(`zg${w}`);
    f.get('j').load(OP.i32Load, 2, firstOutputOffset).set('zhz');
    f.get('zhz').i32(127).op(OP.i32And).set('ziz');
    emitSlowNormal(f);
    for (let w = 0; w < 4; w++)
      f.get('j')
        .get(`zg${w}`)
        .store(OP.i32Store, 2, generatorOffset + 16 * w);
    f.get('a').i32(8).op(OP.i32Mul).get('draw').op(OP.i32Add).get('zout').store(OP.f64Store, 3);
    f.get('lanes').brIf('next');
  });
  return f;
}
