/**
 * The estimates form: its fields (in the units a bench person types), how they become the SI
 * request bodies of /api/estimates/*, and how the server's field names map back to inputs.
 */
import { AppError } from '~/core/errors';
import { normalizeSerial } from '~/core/serial/normalize-serial';

export type PartSource = 'datasheet' | 'part' | 'set';
/** 'half_vp': VGS0 = VP/2 of each part (a quarter of its IDSS); 'vgs0': one fixed VGS0; 'rs': a self-bias resistor. */
export type BiasMode = 'half_vp' | 'vgs0' | 'rs';
export type Terminal = 'gate' | 'source';

export interface EstimateForm {
  source: PartSource;
  idss_ma: string;
  vp_v: string;
  lambda_per_v: string;
  serial: string;
  set_ref: string;
  vds_v: string;
  target_ma: string;
  rs_ohm: string;
  rd_ohm: string;
  mixer: boolean;
  bias_mode: BiasMode;
  vgs0_v: string;
  mixer_rs_ohm: string;
  lo_mv: string;
  lo_terminal: Terminal;
  lo_mhz: string;
  lo_leak_mv: string;
  rf_mv: string;
  rf_terminal: Terminal;
  rf_mhz: string;
  rf_leak_mv: string;
  load_ohm: string;
  probe_pf: string;
}
export type FormField = keyof EstimateForm;

/**
 * Starts at a worked bench case: a square-law part with LO on the source and RF on the gate.
 * The bias, the target current and the drive levels follow the part (`partDefaults`); the
 * mixer is off until asked for.
 */
export const DEFAULT_FORM: EstimateForm = {
  source: 'datasheet',
  idss_ma: '10.12',
  vp_v: '-3.9',
  lambda_per_v: '',
  serial: '',
  set_ref: '',
  vds_v: '10',
  target_ma: '2.5',
  rs_ohm: '',
  rd_ohm: '2200',
  mixer: false,
  bias_mode: 'half_vp',
  vgs0_v: '-1.95',
  mixer_rs_ohm: '',
  lo_mv: '1170',
  lo_terminal: 'source',
  lo_mhz: '10',
  lo_leak_mv: '',
  rf_mv: '390',
  rf_terminal: 'gate',
  rf_mhz: '10.7',
  rf_leak_mv: '',
  load_ohm: '48',
  probe_pf: '',
};

/** Labels with units, used beside the inputs and in messages. */
export const FIELD_LABELS: Record<FormField, string> = {
  source: 'Part',
  idss_ma: 'IDSS (mA)',
  vp_v: 'VP (V, datasheet sign)',
  lambda_per_v: 'λ (1/V, optional)',
  serial: 'Serial',
  set_ref: 'Reservation id or serials',
  vds_v: '|VDS| (V)',
  target_ma: 'Target drain current (mA)',
  rs_ohm: 'Source resistor (Ω)',
  rd_ohm: 'Drain load RD (Ω, optional)',
  mixer: 'Mixer',
  bias_mode: 'Bias',
  vgs0_v: 'VGS0 (V)',
  mixer_rs_ohm: 'Self-bias source resistor (Ω)',
  lo_mv: 'LO amplitude (mV peak)',
  lo_terminal: 'LO drives',
  lo_mhz: 'LO frequency (MHz)',
  lo_leak_mv: 'LO leak on the other terminal (mV peak, optional)',
  rf_mv: 'RF amplitude (mV peak)',
  rf_terminal: 'RF drives',
  rf_mhz: 'RF frequency (MHz)',
  rf_leak_mv: 'RF leak on the other terminal (mV peak, optional)',
  load_ohm: 'Load R (Ω)',
  probe_pf: 'Probe capacitance across the load (pF, optional)',
};

export type FieldErrors = Partial<Record<FormField, string>>;

/** Inputs the form marks; the message lists them, or is the server's when it refused them. */
export class FormInputError extends AppError<'estimate_form_invalid'> {
  constructor(
    readonly fields: FieldErrors,
    message?: string,
  ) {
    super('estimate_form_invalid', { problems: Object.entries(fields).map(([f, m]) => `${FIELD_LABELS[f as FormField]} — ${m}`) });
    if (message) this.message = message;
    this.name = 'FormInputError';
  }
}

/** Reads a number typed by a person (accepts "−" and a decimal comma); undefined when blank. */
export function readNumber(form: EstimateForm, field: FormField, errors: FieldErrors, required: boolean, scale = 1): number | undefined {
  const raw = String(form[field]).trim().replace('\u2212', '-').replace(',', '.');
  if (raw === '') {
    if (required) errors[field] = 'expected a number; this one is needed';
    return undefined;
  }
  const v = Number(raw);
  if (!Number.isFinite(v)) {
    errors[field] = `expected a number, got “${form[field]}”`;
    return undefined;
  }
  return v * scale;
}

/** Serials or a reservation id from the set box (spaces, commas or new lines between serials). */
export function readSetRef(text: string): { reservation_id: string } | { serials: string[] } {
  const t = text.trim();
  if (/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(t)) return { reservation_id: t };
  return { serials: t.split(/[\s,;]+/).map(normalizeSerial).filter(Boolean) };
}

type PartRef = { serial: string } | { idss_a: number; vp_v: number; lambda_per_v?: number };

export function partFields(form: EstimateForm, errors: FieldErrors): PartRef | undefined {
  if (form.source === 'part') {
    const serial = normalizeSerial(form.serial);
    if (!serial) errors.serial = 'expected the serial of a stored part';
    return { serial };
  }
  const idss = readNumber(form, 'idss_ma', errors, true, 1e-3);
  const vp = readNumber(form, 'vp_v', errors, true);
  const lambda = readNumber(form, 'lambda_per_v', errors, false);
  if (idss === undefined || vp === undefined) return undefined;
  return { idss_a: idss, vp_v: vp, ...(lambda !== undefined ? { lambda_per_v: lambda } : {}) };
}

/** The self-bias body for one part, or null when neither a target current nor a resistor is given. */
export function selfBiasBody(form: EstimateForm, part: { serial: string } | PartRef, errors: FieldErrors) {
  const vds = readNumber(form, 'vds_v', errors, true);
  const target = readNumber(form, 'target_ma', errors, false, 1e-3);
  const rs = readNumber(form, 'rs_ohm', errors, false);
  const rd = readNumber(form, 'rd_ohm', errors, false);
  if (target === undefined && rs === undefined) return null;
  return {
    ...part,
    vds_v: vds,
    ...(target !== undefined ? { target_drain_current_a: target } : {}),
    ...(rs !== undefined ? { source_resistor_ohm: rs } : {}),
    ...(rd !== undefined ? { drain_load_ohm: rd } : {}),
  };
}

/** `vgs0PerPart`: the part's own VP/2 when the bias follows each part. */
export function mixerBody(form: EstimateForm, part: { serial: string } | PartRef, errors: FieldErrors, vgs0PerPart?: number) {
  const drive = (p: 'lo' | 'rf') => {
    const leak = readNumber(form, `${p}_leak_mv`, errors, false, 1e-3);
    return {
      amplitude_v: readNumber(form, `${p}_mv`, errors, true, 1e-3),
      terminal: form[`${p}_terminal`],
      frequency_hz: readNumber(form, `${p}_mhz`, errors, true, 1e6),
      ...(leak !== undefined ? { leak_v: leak } : {}),
    };
  };
  const probe = readNumber(form, 'probe_pf', errors, false, 1e-12);
  const bias =
    form.bias_mode === 'rs'
      ? { source_resistor_ohm: readNumber(form, 'mixer_rs_ohm', errors, true) }
      : form.bias_mode === 'half_vp'
        ? { vgs0_v: vgs0PerPart ?? readNumber(form, 'vgs0_v', errors, false) }
        : { vgs0_v: readNumber(form, 'vgs0_v', errors, true) };
  const { lambda_per_v: _lambda, ...mixerPart } = part as PartRef & { lambda_per_v?: number };
  return {
    ...mixerPart,
    ...bias,
    load_ohm: readNumber(form, 'load_ohm', errors, true),
    ...(probe !== undefined ? { probe_capacitance_f: probe } : {}),
    lo: drive('lo'),
    rf: drive('rf'),
  };
}

/** Server field names (per request kind) → form inputs. */
const SERVER_FIELDS: Record<'self-bias' | 'mixer' | 'set', Record<string, FormField>> = {
  'self-bias': {
    serial: 'serial',
    idss_a: 'idss_ma',
    vp_v: 'vp_v',
    lambda_per_v: 'lambda_per_v',
    vds_v: 'vds_v',
    target_drain_current_a: 'target_ma',
    source_resistor_ohm: 'rs_ohm',
    drain_load_ohm: 'rd_ohm',
  },
  mixer: {
    serial: 'serial',
    idss_a: 'idss_ma',
    vp_v: 'vp_v',
    vgs0_v: 'vgs0_v',
    source_resistor_ohm: 'mixer_rs_ohm',
    load_ohm: 'load_ohm',
    probe_capacitance_f: 'probe_pf',
    'lo.amplitude_v': 'lo_mv',
    'lo.terminal': 'lo_terminal',
    'lo.frequency_hz': 'lo_mhz',
    'lo.leak_v': 'lo_leak_mv',
    'rf.amplitude_v': 'rf_mv',
    'rf.terminal': 'rf_terminal',
    'rf.frequency_hz': 'rf_mhz',
    'rf.leak_v': 'rf_leak_mv',
  },
  set: {
    reservation_id: 'set_ref',
    serials: 'set_ref',
    target_drain_current_a: 'target_ma',
    vds_v: 'vds_v',
    drain_load_ohm: 'rd_ohm',
    lo_amplitude_v: 'lo_mv',
  },
};

/** Field errors from an API error body `{ error: { fields: [{ field, message }] } }`. */
export function fieldErrorsFromServer(kind: keyof typeof SERVER_FIELDS, body: unknown): FieldErrors {
  const out: FieldErrors = {};
  const fields = (body as { error?: { fields?: { field: string; message: string }[] } } | null)?.error?.fields ?? [];
  for (const f of fields) {
    const key = SERVER_FIELDS[kind][f.field] ?? SERVER_FIELDS[kind][f.field.split('.')[0]];
    if (key && !out[key]) out[key] = f.message;
  }
  return out;
}

/** Fields whose starting value comes from the part (until the person types their own). */
export const PART_DERIVED_FIELDS = ['target_ma', 'vgs0_v', 'lo_mv', 'rf_mv'] as const;

/** The form values `estimateDefaultsForPart` gives, in the units the form is typed in. */
export function partDefaults(d: { targetCurrentA: number; vgs0V: number; loAmplitudeV: number; rfAmplitudeV: number }): Pick<EstimateForm, (typeof PART_DERIVED_FIELDS)[number]> {
  const text = (x: number) => String(Number(x.toPrecision(4)));
  return { target_ma: text(d.targetCurrentA * 1e3), vgs0_v: text(d.vgs0V), lo_mv: text(d.loAmplitudeV * 1e3), rf_mv: text(d.rfAmplitudeV * 1e3) };
}
