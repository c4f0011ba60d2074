import { eq, inArray, sql } from 'drizzle-orm';
import { lowStockStep } from '~/core/stock/low-stock';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { parseRoles } from '~/lib/access';
import { serverEnv } from '~/lib/server/env';
import { sendMail } from '~/lib/server/mail';
import { binCountsFor } from '../bins/counts';

export interface LowStockAlert {
  alertId: number;
  binId: number;
  code: string;
  label: string;
  deviceType: string;
  location: string | null;
  onHand: number;
  reserved: number;
  issued: number;
  threshold: number;
}

/**
 * Checks the bins after a change to their parts, in the caller's transaction. Each bin row is
 * locked (in id order, after the parts the caller locked), then its on-hand count is taken
 * from the parts' states; a bin that just dropped below its threshold gets one alert row and
 * is marked alerted, a bin back at or above it is re-armed. Concurrent batches on one bin
 * queue on its row lock, so one crossing makes one alert. Returns the alerts to mail once the
 * transaction has committed (`mailLowStockAlerts`). Pass `mayDrop: false` after a change that
 * only adds stock (a receipt): it re-arms bins but never alerts.
 */
export async function checkLowStock(
  tx: DbOrTx,
  binIds: readonly (number | null)[],
  { mayDrop = true }: { mayDrop?: boolean } = {},
): Promise<LowStockAlert[]> {
  const ids = [...new Set(binIds.filter((b): b is number => b !== null))].sort((a, b) => a - b);
  if (ids.length === 0) return [];
  const rows = await tx
    .select({ bin: schema.bin, typeName: schema.deviceType.name, locationName: schema.location.name })
    .from(schema.bin)
    .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .leftJoin(schema.location, eq(schema.location.id, schema.bin.homeLocationId))
    .where(inArray(schema.bin.id, ids))
    .orderBy(schema.bin.id)
    .for('update', { of: schema.bin });
  const counts = await binCountsFor(tx, ids);
  const alerts: LowStockAlert[] = [];
  for (const { bin, typeName, locationName } of rows) {
    const c = counts.get(bin.id)!;
    const step = lowStockStep({ onHand: c.onHand, threshold: bin.lowStockThreshold, alerted: bin.lowStockAlertedAt !== null, mayDrop });
    if (step === 're_arm') {
      await tx.update(schema.bin).set({ lowStockAlertedAt: null }).where(eq(schema.bin.id, bin.id));
    } else if (step === 'alert') {
      const now = new Date();
      await tx.update(schema.bin).set({ lowStockAlertedAt: now }).where(eq(schema.bin.id, bin.id));
      const [row] = await tx
        .insert(schema.lowStockAlert)
        .values({ binId: bin.id, onHand: c.onHand, threshold: bin.lowStockThreshold, crossedAt: now })
        .returning({ id: schema.lowStockAlert.id });
      alerts.push({
        alertId: row.id,
        binId: bin.id,
        code: bin.code,
        label: bin.label,
        deviceType: typeName,
        location: locationName,
        onHand: c.onHand,
        reserved: c.reserved,
        issued: c.issued,
        threshold: bin.lowStockThreshold,
      });
    }
  }
  return alerts;
}

/** E-mail addresses of every enabled account holding the stores role. */
export async function storesRecipients(): Promise<string[]> {
  const rows = await getDb()
    .select({ email: schema.user.email, role: schema.user.role, banned: schema.user.banned })
    .from(schema.user)
    .where(sql`${schema.user.role} like '%stores%'`);
  return rows.filter((r) => !r.banned && parseRoles(r.role).includes('stores')).map((r) => r.email).sort();
}

export function lowStockMail(alert: LowStockAlert, publicUrl: string): { subject: string; text: string } {
  const where = alert.location ?? 'no home location set';
  return {
    subject: `Low stock: bin ${alert.code} of ${alert.deviceType} has ${alert.onHand} on hand (threshold ${alert.threshold})`,
    text: [
      `Bin ${alert.code} of ${alert.deviceType} dropped below its low-stock threshold.`,
      '',
      `Bin:        ${alert.code} — ${alert.label}`,
      `Location:   ${where}`,
      `On hand:    ${alert.onHand}`,
      `Reserved:   ${alert.reserved}`,
      `Issued:     ${alert.issued}`,
      `Threshold:  ${alert.threshold}`,
      '',
      `You get this message once for this drop; the bin alerts again only after its on-hand count`,
      `is back at ${alert.threshold} or more and then falls below it once more.`,
      '',
      `Bin stock: ${publicUrl}/stock?device_type=${encodeURIComponent(alert.deviceType)}&q=${encodeURIComponent(alert.code)}`,
    ].join('\n'),
  };
}

/**
 * Sends one message per alert to all stores people and marks it mailed. A failure to send is
 * logged and leaves mailed_at empty; the stock change it follows has already committed.
 */
export async function mailLowStockAlerts(alerts: readonly LowStockAlert[]): Promise<void> {
  if (alerts.length === 0) return;
  const to = await storesRecipients();
  if (to.length === 0) {
    console.warn(`[low-stock] ${alerts.length} alert(s) but no account holds the stores role; nothing mailed`);
    return;
  }
  for (const alert of alerts) {
    try {
      await sendMail({ to, ...lowStockMail(alert, serverEnv().publicUrl) });
      await getDb().update(schema.lowStockAlert).set({ mailedAt: new Date() }).where(eq(schema.lowStockAlert.id, alert.alertId));
    } catch (err) {
      console.error(`[low-stock] could not mail the alert for bin ${alert.code}:`, err);
    }
  }
}
