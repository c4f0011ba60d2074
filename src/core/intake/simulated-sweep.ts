import { drainCurrentA } from '../fit/series-resistance';
import type { Channel, JfetParams } from '../jfet-model';
import { seededRandom } from '../random/seeded-random';

/**
 * Invented sweep files for the demo, the end-to-end bench and the tests: a SPICE level-1
 * family (the model of src/core/jfet-model.ts) written in our long CSV format. Pure.
 */

export function gaussian(rand: () => number): number {
  const u = Math.max(rand(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/**
 * A plausible small-signal part: |VTO| 0.6–4 V, IDSS 2–20 mA at 10 V with larger IDSS at
 * larger |VTO| (as within one JFET type), LAMBDA 0.005–0.03 /V, and RS/RD on about a third.
 */
export function randomPartParams(rand: () => number): JfetParams {
  const vto = -(0.6 + 3.4 * rand());
  const position = 0.65 * ((-vto - 0.6) / 3.4) + 0.35 * rand();
  const idss = 2e-3 * Math.pow(10, Math.min(1, Math.max(0, position)));
  const lambda = 0.005 + 0.025 * rand();
  const beta = idss / (vto * vto * (1 + lambda * 10));
  const series = rand() < 0.33;
  return { vtoV: vto, betaAPerV2: beta, lambdaPerV: lambda, rsOhm: series ? 5 + 35 * rand() : 0, rdOhm: series ? 5 + 35 * rand() : 0 };
}

export type Defect = 'none' | 'self_heating' | 'breakdown';

export interface SimulatedSweepOptions {
  serial: string;
  channel: Channel;
  params: JfetParams;
  deviceType?: string;
  lot?: string;
  temperatureC?: number;
  station?: string;
  operator?: string;
  /** Gate steps from VGS = 0 towards pinch-off (default 9). */
  gateSteps?: number;
  /** Points per curve from VDS = 0 to vdsMaxV (default 41 over 0–15 V). */
  pointsPerCurve?: number;
  vdsMaxV?: number;
  /** Gaussian noise, as a fraction of IDSS at the top VDS (default 0.003). */
  noiseFraction?: number;
  defect?: Defect;
  rand?: () => number;
}

/** The family as long-format CSV text in datasheet signs (P-channel: VGS positive, VDS and ID negative). */
export function simulateSweepCsv(o: SimulatedSweepOptions): string {
  const rand = o.rand ?? seededRandom(1);
  const steps = o.gateSteps ?? 9;
  const points = o.pointsPerCurve ?? 41;
  const vdsMax = o.vdsMaxV ?? 15;
  const noise = o.noiseFraction ?? 0.003;
  const idssTop = o.params.betaAPerV2 * o.params.vtoV ** 2 * (1 + o.params.lambdaPerV * vdsMax);
  const sign = o.channel === 'n' ? 1 : -1;
  const lines: string[] = [`# serial: ${o.serial}`];
  if (o.deviceType) lines.push(`# device type: ${o.deviceType}`);
  if (o.lot) lines.push(`# lot: ${o.lot}`);
  if (o.temperatureC !== undefined) lines.push(`# temperature_c: ${o.temperatureC.toFixed(1)}`);
  if (o.station) lines.push(`# station: ${o.station}`);
  if (o.operator) lines.push(`# operator: ${o.operator}`);
  lines.push('vgs (V),vds (V),id (mA)');
  for (let k = 0; k < steps; k++) {
    // From 0 V to 80 % of the way to pinch-off: every step conducts.
    const vgs = (o.params.vtoV * 0.8 * k) / Math.max(1, steps - 1);
    for (let j = 0; j < points; j++) {
      const vds = (vdsMax * j) / (points - 1);
      let id = drainCurrentA(o.params, vgs, vds);
      if (o.defect === 'self_heating') {
        // Dissipation heats the die: the current droops with power and the saturation slope turns negative.
        const p = (vds * id) / (vdsMax * idssTop);
        id *= 1 - 0.3 * p * p;
      } else if (o.defect === 'breakdown' && k < 3) {
        id *= 1 + 0.35 * Math.exp((vds - vdsMax) / 0.6);
      }
      if (j > 0) id += gaussian(rand) * noise * idssTop;
      const vgsText = (sign * vgs).toFixed(4);
      const vdsText = (sign * vds).toFixed(4);
      const idText = j === 0 ? '0' : (sign * id * 1e3).toPrecision(6);
      lines.push(`${vgsText},${vdsText},${idText}`);
    }
  }
  return lines.join('\n') + '\n';
}
