// A combination coupon (QW-306, from memory): several processes in one coupon, e.g. a GTAW root and an SMAW
// fill. Each process qualifies with the weld metal it deposited, so certification issues one qualification
// per process, each with its own thickness range; a failure of any part of the examination fails them all.
import { type Coupon, type CouponInput } from '../schemas/coupon.js';
import { type DepositLayer } from '../schemas/examination.js';
import { toInches } from '../units/length.js';

type Layer = Omit<DepositLayer, 'depositedThickness'> & { depositedThickness: { value: number; unit: 'in' | 'mm' } };

/**
 * The coupon as each of its processes qualifies with it: the process, the weld metal it deposited and its
 * own transfer mode, F-No., layers and filler, on the coupon's joint. Layers of one process (a GTAW root
 * and hot pass) add up to one deposit. A coupon of one process is itself.
 */
export function couponPerProcess<C extends CouponInput | Coupon>(c: C, layers: Layer[] | undefined | null): C[] {
  if (!layers || layers.length === 0) return [c];
  const byProcess = new Map<string, Layer>();
  for (const l of layers) {
    const seen = byProcess.get(l.process);
    if (!seen) byProcess.set(l.process, l);
    else {
      const same = seen.depositedThickness.unit === l.depositedThickness.unit;
      byProcess.set(l.process, {
        ...seen,
        ...(seen.layers !== undefined && l.layers !== undefined ? { layers: seen.layers + l.layers } : {}),
        depositedThickness: same
          ? { value: seen.depositedThickness.value + l.depositedThickness.value, unit: seen.depositedThickness.unit }
          : { value: toInches(seen.depositedThickness) + toInches(l.depositedThickness), unit: 'in' },
      });
    }
  }
  return [...byProcess.values()].map((l) => {
    const { transferMode, fNumber, layers: count, withoutFiller, ...rest } = c as Coupon;
    // the coupon's own transfer mode and filler words are those of its main process
    const own = l.process === c.process;
    const mode = l.transferMode ?? (own ? transferMode : undefined);
    const f = l.fNumber ?? fNumber;
    const n = l.layers ?? count;
    const bare = l.withoutFiller ?? (own ? withoutFiller : undefined);
    return {
      ...rest,
      process: l.process,
      depositedThickness: l.depositedThickness,
      ...(mode ? { transferMode: mode } : {}),
      ...(f !== undefined ? { fNumber: f } : {}),
      ...(n !== undefined ? { layers: n } : {}),
      ...(bare !== undefined ? { withoutFiller: bare } : {}),
    } as C;
  });
}
