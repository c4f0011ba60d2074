import { eq, inArray } from 'drizzle-orm';
import { lotSummaryText, summarizeUploadByLot } from '~/core/intake/summarize-upload-by-lot';
import { unknownLotOf } from '~/core/intake/upload-verdict';
import { formatDateTime } from '~/core/units/format-date';
import { LotSummaryMailRequest, type LotSummaryMailed, type UploadSummaryJson } from '~/contracts/uploads';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { serverEnv } from '~/lib/server/env';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { deliverMail } from '~/lib/server/mail';
import { getUpload } from './get';

/**
 * One upload summarised per lot: each file under the lot of its parts (a refused file under
 * the lot it names or the upload's lot tag), counted as fitted, flagged or refused by reason.
 */
export async function getUploadLotSummary({ actor, id }: { actor: Actor | null; id: unknown }): Promise<UploadSummaryJson> {
  const upload = await getUpload({ actor, id });
  const db = getDb();
  const serials = [...new Set(upload.files.flatMap((f) => f.serials))];
  const partLots = serials.length
    ? await db
        .select({ serial: schema.part.serial, lot: schema.lot.code })
        .from(schema.part)
        .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
        .where(inArray(schema.part.serial, serials))
    : [];
  const lotOfSerial = new Map(partLots.map((p) => [p.serial, p.lot]));
  const tagLot = typeof (upload.tags as Record<string, unknown>)?.lot === 'string' && (upload.tags as Record<string, string>).lot.trim() ? (upload.tags as Record<string, string>).lot.trim() : null;
  const summaries = summarizeUploadByLot(
    upload.files.map((f) => ({
      name: f.name,
      state: f.state,
      errorCode: f.error_code,
      reason: f.reason,
      lot: f.serials.map((s) => lotOfSerial.get(s)).find((l) => l) ?? unknownLotOf(f) ?? tagLot,
      parts: f.serials.length,
    })),
  );
  const codes = summaries.map((s) => s.lot).filter((l): l is string => l !== null);
  const lotRows = codes.length
    ? await db
        .select({ code: schema.lot.code, supplier: schema.lot.supplier, supplierEmail: schema.lot.supplierEmail, type: schema.deviceType.name })
        .from(schema.lot)
        .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.lot.deviceTypeId))
        .where(inArray(schema.lot.code, codes))
    : [];
  const lotInfo = new Map(lotRows.map((l) => [l.code, l]));
  const [head] = await db
    .select({ userName: schema.user.name, createdAt: schema.upload.createdAt })
    .from(schema.upload)
    .leftJoin(schema.user, eq(schema.user.id, schema.upload.userId))
    .where(eq(schema.upload.id, upload.upload_id));
  return {
    upload_id: upload.upload_id,
    created_at: upload.created_at,
    uploaded_by: head?.userName ?? 'a test station',
    done: upload.done,
    lots: summaries.map((s) => {
      const info = s.lot ? lotInfo.get(s.lot) : undefined;
      return { ...s, device_type: info?.type ?? null, supplier: info?.supplier ?? '', supplier_email: info?.supplierEmail ?? '' };
    }),
  };
}

/**
 * Mails one lot's summary of an upload to the supplier contact through the configured SMTP
 * server, and keeps the address on the lot for next time. The send is audited on the lot.
 */
export async function mailLotSummary({ actor, id, input }: { actor: Actor | null; id: unknown; input: unknown }): Promise<LotSummaryMailed> {
  requirePermission(actor, 'lots:create');
  const data = LotSummaryMailRequest.parse(input);
  const summary = await getUploadLotSummary({ actor, id });
  const lot = summary.lots.find((l) => l.lot === data.lot);
  if (!lot) {
    throw new AppError('upload_lot_absent', { upload: summary.upload_id.slice(0, 8), lot: data.lot, lots: summary.lots.map((l) => l.lot ?? '(not known)') });
  }
  if (!summary.done) throw new AppError('upload_still_fitting', { upload: summary.upload_id.slice(0, 8) });
  const db = getDb();
  const [row] = await db.select().from(schema.lot).where(eq(schema.lot.code, data.lot));
  if (!row) throw new AppError('lot_summary_lot_unknown', { lot: data.lot });
  const [me] = actor.userId ? await db.select({ name: schema.user.name, email: schema.user.email }).from(schema.user).where(eq(schema.user.id, actor.userId)) : [];
  const sender = me ? `${me.name} <${me.email}>` : actor.label;
  const subject = `Incoming inspection: lot ${data.lot} — ${lot.fitted} fitted, ${lot.needs_review} flagged, ${lot.rejected} refused`;
  const text = lotSummaryText(lot, {
    deviceType: lot.device_type,
    uploadedAt: formatDateTime(summary.created_at),
    uploadedBy: summary.uploaded_by,
    sender,
    link: `${serverEnv().publicUrl}/upload/${summary.upload_id}/summary`,
  });
  try {
    await deliverMail({ to: data.to, subject, text });
  } catch (err) {
    throw new AppError('mail_not_taken', { to: data.to, reason: (err as Error).message });
  }
  await db.transaction(async (tx) => {
    if (row.supplierEmail !== data.to) {
      await tx.update(schema.lot).set({ supplierEmail: data.to }).where(eq(schema.lot.id, row.id));
    }
    await writeAudit(tx, actor, {
      action: 'lot.summary_mail',
      subjectType: 'lot',
      subjectId: data.lot,
      before: { supplier_email: row.supplierEmail },
      after: { supplier_email: data.to, upload_id: summary.upload_id, fitted: lot.fitted, needs_review: lot.needs_review, rejected: lot.rejected },
    });
  });
  return { sent_to: data.to, subject, lot: data.lot };
}
