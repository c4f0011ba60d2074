import { and, eq, inArray, isNull, notInArray, sql } from 'drizzle-orm';
import type { PlannedPart } from '~/core/intake/plan-sweep-file';
import { IngestRejection } from '~/core/intake/ingest-rejection';
import { checkPartTransition, type PartStatus } from '~/core/stock/part-transitions';
import { getDb, schema } from '~/db/client';
import { insertRowsAsJson, jsonRecordset } from '~/db/insert-rows-as-json';
import { writeAudit } from '~/lib/server/audit';
import type { Actor } from '~/lib/server/identity';
import { assignBinsForParts } from '../bins/assign-bins';
import { fitColumns } from '../fits/fit-columns';
import { changePartStatuses, type StatusChange } from '../parts/change-status';
import { toStoredCurves } from '../sweeps/stored-curves';
import type { DeviceTypeRecord } from './catalogue-cache';
import { outcomeOf, type IngestOutcome, type UploadFileRow, type UploadFileState } from './upload-file-rows';

/** Statuses in which a part cannot take a new sweep: it is promised to someone or gone. */
const NO_NEW_SWEEP: Partial<Record<PartStatus, string>> = {
  reserved: 'is reserved for a designer; release the reservation before retesting it',
  issued: 'has been issued; take it back as a return before retesting it',
  scrapped: 'is scrapped; a scrapped part is never measured again',
};

/** A file read, parsed and fitted, waiting to be stored. */
export interface PlannedFile {
  file: UploadFileRow;
  actor: Actor;
  plan: { type: DeviceTypeRecord; parts: PlannedPart[] };
}

/**
 * Stores a group of planned files in ONE transaction (see `storageGroups` for what may share
 * one). Throws IngestRejection, storing nothing, when a part cannot take a new sweep.
 */
export async function persistPlans(group: PlannedFile[]): Promise<IngestOutcome[]> {
  const actor = group[0].actor;
  return getDb().transaction(async (tx) => {
    const ids = group.map((f) => f.file.id).sort((a, b) => a - b);
    const locked = await tx.select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, ids)).orderBy(schema.uploadFile.id).for('update');
    const lockedById = new Map(locked.map((l) => [l.id, l]));
    const out: IngestOutcome[] = [];
    let live = group.filter((f) => {
      const now = lockedById.get(f.file.id);
      if (now && now.state === 'queued' && now.duplicateOfId === null) return true;
      out.push(outcomeOf(now ?? f.file));
      return false;
    });
    if (live.length === 0) return out;

    // The same bytes may have been fitted meanwhile from another upload: no second sweep.
    // Locks in SHA order, so two groups cannot wait on each other.
    const shas = [...new Set(live.map((f) => f.file.sha256))].sort();
    await tx.execute(
      sql`select pg_advisory_xact_lock(hashtextextended(t.sha, 0)) from (select sha from (values ${sql.join(
        shas.map((s) => sql`(${s})`),
        sql`, `,
      )}) as v(sha) order by sha offset 0) as t`,
    );
    const earlier = await tx
      .select()
      .from(schema.uploadFile)
      .where(
        and(
          inArray(schema.uploadFile.sha256, shas),
          notInArray(schema.uploadFile.id, ids),
          isNull(schema.uploadFile.duplicateOfId),
          inArray(schema.uploadFile.state, ['fitted', 'needs_review']),
        ),
      )
      .orderBy(schema.uploadFile.id);
    const earlierBySha = new Map<string, UploadFileRow>();
    for (const e of earlier) if (!earlierBySha.has(e.sha256)) earlierBySha.set(e.sha256, e);
    const copies = live.filter((f) => earlierBySha.has(f.file.sha256));
    for (const f of copies) {
      const first = earlierBySha.get(f.file.sha256)!;
      await tx.update(schema.uploadFile).set({ duplicateOfId: first.id, finishedAt: new Date() }).where(eq(schema.uploadFile.id, f.file.id));
      out.push({ uploadFileId: f.file.id, state: first.state, reason: null, serials: first.serials });
    }
    live = live.filter((f) => !earlierBySha.has(f.file.sha256));
    if (live.length === 0) return out;

    const entries = live.flatMap((f) => f.plan.parts.map((p) => ({ f, p })));
    const bySerial = [...entries].sort((a, b) => (a.p.serial < b.p.serial ? -1 : a.p.serial > b.p.serial ? 1 : 0));
    await tx
      .insert(schema.part)
      .values(bySerial.map(({ f, p }) => ({ serial: p.serial, deviceTypeId: f.plan.type.id, lotId: p.lotId })))
      .onConflictDoNothing({ target: schema.part.serial });
    // Locked in id order, as every status change locks them, so batches cannot deadlock.
    const partRows = await tx
      .select()
      .from(schema.part)
      .where(inArray(schema.part.serial, bySerial.map((e) => e.p.serial)))
      .orderBy(schema.part.id)
      .for('update');
    const partBySerial = new Map(partRows.map((r) => [r.serial, r]));
    for (const { f, p } of entries) {
      const existing = partBySerial.get(p.serial)!;
      const type = f.plan.type;
      if (existing.deviceTypeId !== type.id) {
        throw new IngestRejection('type_conflict', { file: f.file.originalName, serial: p.serial, typeName: type.name });
      }
      const refusal = NO_NEW_SWEEP[existing.status];
      if (refusal) throw new IngestRejection('part_unavailable', { file: f.file.originalName, serial: p.serial, refusal });
    }

    const sweeps = await insertRowsAsJson(
      tx,
      schema.sweep,
      entries.map(({ f, p }) => ({
        partId: partBySerial.get(p.serial)!.id,
        uploadFileId: f.file.id,
        indexInFile: p.indexInFile,
        vgsStepsV: p.curves.map((c) => c.vgsV),
        curves: toStoredCurves(p.curves),
        pointCount: p.pointCount,
        temperatureC: p.temperatureC,
        station: p.station,
        operator: p.operator,
        metadata: p.metadata,
      })),
      ['id', 'partId'],
    );
    const sweepByPart = new Map(sweeps.map((s) => [s.partId, s.id]));

    // A clean fit goes to accepted where the part's state allows; otherwise a person looks.
    const targets = entries.map(({ f, p }) => {
      const part = partBySerial.get(p.serial)!;
      const wanted: PartStatus = p.fit.needsReview ? 'needs_review' : 'accepted';
      const to: PartStatus = part.status === wanted || checkPartTransition(part.status, wanted).ok ? wanted : 'needs_review';
      return { f, p, part, to };
    });
    const fits = await insertRowsAsJson(
      tx,
      schema.fit,
      targets.map(({ f, p, part, to }) =>
        fitColumns(p.fit, f.plan.type.channel, { sweepId: sweepByPart.get(part.id)!, partId: part.id }, to === 'accepted' ? 'auto_accepted' : 'needs_review'),
      ),
      ['id', 'partId'],
    );
    const fitByPart = new Map(fits.map((f) => [f.partId, f.id]));

    const currentFits = jsonRecordset(
      schema.part,
      targets.map(({ p, part }) => ({ id: part.id, currentFitId: fitByPart.get(part.id)!, lotId: p.lotId })),
    );
    await tx.execute(sql`
      update ${schema.part} set current_fit_id = x.current_fit_id, lot_id = coalesce(${schema.part.lotId}, x.lot_id), updated_at = now()
      from ${currentFits.from} where ${schema.part.id} = x.id`);
    await writeAudit(
      tx,
      actor,
      targets.map(({ f, p, part }) => ({
        action: 'part.sweep',
        subjectType: 'part',
        subjectId: p.serial,
        after: {
          sweep_id: sweepByPart.get(part.id),
          fit_id: fitByPart.get(part.id),
          upload_file_id: f.file.id,
          file_name: f.file.originalName,
          flags: p.fit.flags.map((flag) => flag.code),
        },
      })),
    );

    const changes: StatusChange[] = targets
      .filter((t) => t.part.status !== t.to)
      .map((t) => ({ partId: t.part.id, to: t.to, reason: `fitted from ${t.f.file.originalName}` }));
    await changePartStatuses(tx, actor, changes, { action: 'part.fit' });
    await assignBinsForParts(
      tx,
      actor,
      targets.filter((t) => t.to === 'accepted').map((t) => t.part.id),
    );

    const toReview = new Set(targets.filter((t) => t.to === 'needs_review').map((t) => t.f));
    const finished = live.map((f) => ({
      id: f.file.id,
      state: (toReview.has(f) ? 'needs_review' : 'fitted') as UploadFileState,
      serials: f.plan.parts.map((p) => p.serial),
    }));
    await tx.execute(sql`
      update ${schema.uploadFile} set state = x.state, reason = null, error_code = null, serials = x.serials, finished_at = now()
      from ${jsonRecordset(schema.uploadFile, finished).from} where ${schema.uploadFile.id} = x.id`);
    for (const f of finished) out.push({ uploadFileId: f.id, state: f.state, reason: null, serials: f.serials });
    return out;
  });
}
