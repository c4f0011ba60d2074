import { normalizeSerial } from '~/core/serial/normalize-serial';
import { and, asc, desc, eq } from 'drizzle-orm';
import type { FitResult } from '~/core/fit/definitions';
import { formatModelCard } from '~/core/fit/model-card';
import { fromNEquivalent, intrinsicDrainCurrentA } from '~/core/jfet-model';
import { stepCurrentsAt } from '~/core/operating-point/operating-table';
import { partOperatingFigures } from '~/core/operating-point/part-operating-figures';
import { loadPartBases } from './part-basis';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { AuditEntryJson } from '~/contracts/audit';
import type { FitJson, FitStandardErrorsJson, FlagDetailJson, NoFitJson, PartDetailJson, PartOperatingJson } from '~/contracts/parts';
import { describeAuditRows } from '../audit/describe-rows';
import type { SweepNoteJson } from '../intake/ingest-stored-file';
import type { StoredCurve } from '../sweeps/stored-curves';
import { partJson } from './part-json';

/** NaN (a standard error that could not be estimated) is sent as null. */
function num(x: number | null | undefined): number | null {
  return typeof x === 'number' && Number.isFinite(x) ? x : null;
}

type FitRow = typeof schema.fit.$inferSelect;

/** Standard errors of a fit's parameters and derived figures, same units as the figures. */
export function standardErrorsOf(fit: FitRow): FitStandardErrorsJson | null {
  const d = fit.detail as FitResult;
  if (d.status !== 'fitted') return null;
  return {
    vto_v: num(d.parameters.vtoV.standardError),
    beta_a_per_v2: num(d.parameters.betaAPerV2.standardError),
    lambda_per_v: num(d.parameters.lambdaPerV.standardError),
    rs_ohm: num(d.parameters.rsOhm.standardError),
    rd_ohm: num(d.parameters.rdOhm.standardError),
    idss_a: num(d.derived.idssA.standardError),
    vp_v: num(d.derived.vpV.standardError),
    gfs_s: num(d.derived.gfsS.standardError),
    gos_s: num(d.derived.gosS.standardError),
    rds_on_ohm: num(d.derived.rdsOnOhm.standardError),
  };
}

export function flagDetailsOf(fit: FitRow): FlagDetailJson[] {
  const d = fit.detail as Partial<FitResult>;
  // Rows written without the full result (e.g. imported) still have the flag codes.
  if (!Array.isArray(d.flags)) return fit.flags.map((code) => ({ code, message: code, excluded_points: [] }));
  return d.flags.map((f) => ({ code: f.code, message: f.message, excluded_points: f.excludedPoints ?? [] }));
}

/** The figures of one fit in API names (units in the names; VP in datasheet sign). */
export function fitJson(fit: FitRow): FitJson {
  const d = fit.detail as FitResult;
  return {
    fit_id: fit.id,
    model: fit.model,
    engine_version: fit.engineVersion,
    vto_v: fit.vtoV,
    beta_a_per_v2: fit.betaAPerV2,
    lambda_per_v: fit.lambdaPerV,
    rs_ohm: fit.rsOhm,
    rd_ohm: fit.rdOhm,
    idss_a: fit.idssA,
    idss_measured_a: d.status === 'fitted' ? num(d.derived.idssMeasuredA) : null,
    idss_vds_v: fit.idssVdsV,
    vp_v: fit.vpV,
    gfs_s: fit.gfsS,
    gos_s: fit.gosS,
    rds_on_ohm: fit.rdsOnOhm,
    rms_rel: num(fit.rmsRel),
    rms_a: d.status === 'fitted' ? num(d.quality.rmsResidualA) : null,
    r_squared: d.status === 'fitted' ? num(d.quality.rSquared) : null,
    iterations: d.status === 'fitted' ? d.quality.iterations : null,
    points_fitted: d.status === 'fitted' ? d.quality.pointsFitted : null,
    extended_test:
      d.status === 'fitted' && d.extendedTest
        ? { f_statistic: num(d.extendedTest.fStatistic), p_value: num(d.extendedTest.pValue), kept: d.extendedTest.kept }
        : null,
    flags: fit.flags,
    flag_details: flagDetailsOf(fit),
    review: fit.review,
    review_note: fit.reviewNote,
    fitted_at: fit.createdAt.toISOString(),
    standard_errors: standardErrorsOf(fit),
  };
}

/**
 * A part with its latest fit, test conditions, sweep history, model card and (for people who
 * may read the audit log) its audit trail. `serial` is matched after `normalizeSerial`.
 */
export async function getPartBySerial({ actor, serial }: { actor: Actor | null; serial: string }): Promise<PartDetailJson> {
  requirePermission(actor, 'parts:read');
  const db = getDb();
  const [row] = await db
    .select({ part: schema.part, type: schema.deviceType, lot: schema.lot, bin: schema.bin, location: schema.location })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .where(eq(schema.part.serial, normalizeSerial(serial)));
  if (!row) throw new AppError('part_not_found', { serial: normalizeSerial(serial) });
  const { part, type } = row;

  const sweeps = await db
    .select({ sweep: schema.sweep, fileName: schema.uploadFile.originalName, uploadId: schema.uploadFile.uploadId })
    .from(schema.sweep)
    .leftJoin(schema.uploadFile, eq(schema.uploadFile.id, schema.sweep.uploadFileId))
    .where(eq(schema.sweep.partId, part.id))
    .orderBy(desc(schema.sweep.measuredAt), desc(schema.sweep.id));
  const fits = await db.select().from(schema.fit).where(eq(schema.fit.partId, part.id)).orderBy(asc(schema.fit.id));
  const current = fits.find((f) => f.id === part.currentFitId) ?? null;
  const currentSweep = current ? sweeps.find((s) => s.sweep.id === current.sweepId)?.sweep : sweeps[0]?.sweep;

  let audit: AuditEntryJson[] | null = null;
  if (actor.permissions.includes('audit:read')) {
    const entries = await db
      .select()
      .from(schema.auditLog)
      .where(and(eq(schema.auditLog.subjectType, 'part'), eq(schema.auditLog.subjectId, part.serial)))
      .orderBy(asc(schema.auditLog.at), asc(schema.auditLog.id));
    audit = await describeAuditRows(db, entries);
  }

  const fitsBySweep = new Map<number, FitRow[]>();
  for (const f of fits) fitsBySweep.set(f.sweepId, [...(fitsBySweep.get(f.sweepId) ?? []), f]);
  const empty: NoFitJson = {
    fit_id: null, model: null, engine_version: null, vto_v: null, beta_a_per_v2: null, lambda_per_v: null, rs_ohm: null, rd_ohm: null,
    idss_a: null, idss_measured_a: null, idss_vds_v: null, vp_v: null, gfs_s: null, gos_s: null, rds_on_ohm: null, rms_rel: null,
    rms_a: null, r_squared: null, iterations: null, points_fitted: null, extended_test: null, flags: [], flag_details: [], review: null,
    review_note: null, fitted_at: null, standard_errors: null,
  };

  const stored = current ? (await loadPartBases(db, [part.id])).get(part.id) : undefined;
  const sign = (x: number) => fromNEquivalent(type.channel, x);
  let operating: PartOperatingJson | null = null;
  if (stored && current) {
    const vdsTest = current.idssVdsV;
    const idss = partOperatingFigures(stored.basis, { kind: 'idss', vdsV: vdsTest });
    const d = current.detail as Partial<FitResult>;
    const agreement = d.status === 'fitted' ? (d.modelAgreement ?? null) : null;
    const steps = stored.basis.table ? stepCurrentsAt(stored.basis.table, vdsTest) : [];
    const p = stored.basis.params;
    const top = steps.length ? Math.max(...steps.map((x) => x.vgsV)) : 0;
    const modelCurve = Array.from({ length: 41 }, (_, i) => {
      const vgs = p.vtoV + ((top - p.vtoV) * i) / 40;
      return { vgs_v: sign(vgs), id_a: intrinsicDrainCurrentA(p, vgs, vdsTest) };
    });
    operating = {
      /** IDSS at the test VDS, compared at 25 °C: the same figure every set view shows at this VDS. */
      idss_a: idss.usable ? idss.figures.idssA : null,
      idss_source: idss.usable ? idss.figures.source : null,
      idss_vds_v: sign(vdsTest),
      temperature_c: idss.usable ? idss.figures.temperatureC : 25,
      measured_at_c: stored.basis.measuredAtC ?? null,
      model_agreement: agreement
        ? {
            vds_v: sign(agreement.vdsTestV),
            threshold_v: agreement.thresholdV,
            max_disagreement_v: agreement.maxDisagreementV,
            flagged: agreement.flagged,
            points: agreement.points.map((x) => ({
              fraction: x.fraction,
              id_a: x.idA,
              vgs_measured_v: sign(x.vgsMeasuredV),
              vgs_model_v: sign(x.vgsModelV),
              vgs_sigma_v: x.vgsSigmaV,
            })),
          }
        : null,
      transfer: { measured: steps.map((x) => ({ vgs_v: sign(x.vgsV), id_a: x.idA })), model: modelCurve },
    };
  }

  return {
    ...partJson(row),
    ...(current ? fitJson(current) : empty),
    test_conditions: currentSweep
      ? {
          temperature_c: currentSweep.temperatureC,
          station: currentSweep.station,
          operator: currentSweep.operator,
          vds_test_v: current?.idssVdsV ?? type.vdsTestV,
          measured_at: currentSweep.measuredAt.toISOString(),
        }
      : null,
    model_card: current
      ? formatModelCard({
          serial: part.serial,
          channel: type.channel,
          params: { vtoV: current.vtoV, betaAPerV2: current.betaAPerV2, lambdaPerV: current.lambdaPerV, rsOhm: current.rsOhm, rdOhm: current.rdOhm },
          temperatureC: currentSweep?.temperatureC ?? null,
        })
      : null,
    current_sweep: currentSweep
      ? {
          sweep_id: currentSweep.id,
          curves: currentSweep.curves as StoredCurve[],
          excluded_points: currentSweep.excludedPoints as [number, number][],
          notes: ((currentSweep.metadata as { notes?: SweepNoteJson[] } | null)?.notes ?? []).map((n) => ({ code: n.code, vgs_v: n.vgs_v, message: n.message })),
        }
      : null,
    sweeps: sweeps.map(({ sweep, fileName, uploadId }) => ({
      sweep_id: sweep.id,
      measured_at: sweep.measuredAt.toISOString(),
      file_name: fileName,
      upload_id: uploadId,
      temperature_c: sweep.temperatureC,
      station: sweep.station,
      operator: sweep.operator,
      point_count: sweep.pointCount,
      vgs_steps_v: sweep.vgsStepsV,
      is_current: sweep.id === currentSweep?.id,
      fits: (fitsBySweep.get(sweep.id) ?? []).map((f) => ({
        fit_id: f.id,
        fitted_at: f.createdAt.toISOString(),
        idss_a: f.idssA,
        vp_v: f.vpV,
        rms_rel: num(f.rmsRel),
        flags: f.flags,
        review: f.review,
        is_current: f.id === part.currentFitId,
      })),
    })),
    operating,
    audit,
  };
}
