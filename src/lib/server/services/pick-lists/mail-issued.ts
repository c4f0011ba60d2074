import { getDb } from '~/db/client';
import { serverEnv } from '~/lib/server/env';
import { sendMail } from '~/lib/server/mail';
import { loadReservationView } from '../reservations/reservation-view';

const mv = (v: number) => `${(v * 1e3).toFixed(1)} mV`;

/**
 * Tells the designer their matched parts were issued: each set with its serials and figures.
 * Returns the address written to, or null when sending failed (logged; the issue stands).
 */
export async function mailIssuedReservation(reservationId: string): Promise<string | null> {
  const view = await loadReservationView(getDb(), reservationId);
  if (!view) return null;
  const lines = [
    `Hello ${view.designer.name},`,
    '',
    `Stores have picked and issued the parts of your reservation ${view.code}${view.purpose ? ` (${view.purpose})` : ''}:`,
    '',
  ];
  for (const s of view.sets) {
    const parts = s.parts.map((p) => `${p.serial} (${p.role}${p.cascode_index !== undefined ? ` ${p.cascode_index + 1}` : ''})`).join(', ');
    lines.push(`  Set ${s.index + 1}: ${parts}${s.dvgs_v !== null ? `; |ΔVGS| ${mv(s.dvgs_v)}` : ''}`);
  }
  lines.push('', `Model cards and figures for each set: ${serverEnv().publicUrl}/reservations/${view.id}`, '');
  try {
    await sendMail({ to: view.designer.email, subject: `Your matched parts are issued (reservation ${view.code})`, text: lines.join('\n') });
    return view.designer.email;
  } catch (err) {
    console.error('[pick-lists] issue mail failed', err);
    return null;
  }
}
