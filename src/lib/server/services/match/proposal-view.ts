/**
 * The JSON a proposal answers with (and is stored as). Voltages at the operating point are in
 * datasheet sign for the type's channel (VGS positive for a P-channel part); currents, gm and
 * VDS(sat) are magnitudes. Browser code imports these as types only.
 */
export interface ProposedPart {
  part_id: number;
  serial: string;
  role: 'a' | 'b' | 'c' | 'd' | 'lower' | 'upper';
  /** Matched cascode sets: which of the two cascodes (0 or 1) the part is in. */
  cascode_index?: 0 | 1;
  vgs_v: number;
  /** One standard deviation of vgs_v (V); 0 when the part's fit states none. */
  vgs_sigma_v: number;
  gm_s: number;
  gos_s: number;
  /** IDSS at this part's VDS in the set (measured where the sweep reaches it). */
  idss_a: number;
  /** Where the figures came from: the part's measurements, or its fitted model (extrapolated). */
  source: 'measured' | 'model';
  /** VGS correction applied to bring the part from its sweep's temperature to the compare temperature (V, datasheet sign). */
  temperature_shift_v: number;
  id_a: number;
  /** |VDS| this part sees in the set (a cascode's lower runs at −VGS of its upper). */
  vds_v: number;
  vds_sat_v: number;
  bin_code: string | null;
  location: string | null;
  lot: string | null;
}

export interface ProposedSet {
  index: number;
  parts: ProposedPart[];
  dvgs_v: number;
  /** One standard deviation of dvgs_v (V). */
  dvgs_sigma_v: number;
  gm_mismatch: number;
  idss_mismatch: number;
  /** Σ mismatch/tolerance over the constrained figures (≤ 3). */
  cost: number;
  /** Cascodes: least (−VGS(upper)) − VDS(sat, lower) over the set's cascodes (V). */
  cascode_headroom_v?: number;
}

export interface ProposalTolerances {
  /** null = not constrained. */
  max_dvgs_v: number | null;
  max_gm_mismatch: number | null;
  max_idss_mismatch: number | null;
  cascode_margin_v: number | null;
}

export interface ProposalView {
  id: string;
  created_at: string;
  device_type: { id: number; name: string; channel: 'n' | 'p' };
  shape: 'pair' | 'quad' | 'cascode_pair' | 'matched_cascode_pairs';
  count_requested: number;
  operating_point: {
    kind: 'current' | 'idss' | 'self_bias';
    /** Datasheet sign for the channel. */
    id_a: number | null;
    vds_v: number;
    rs_ohm: number | null;
  };
  tolerances: ProposalTolerances;
  same_lot: boolean;
  bins: string[] | null;
  /** Temperature the parts are compared at (°C). */
  temperature_c: number;
  /** A set meets the ΔVGS tolerance only when ΔVGS + this many σ(ΔVGS) stays within it. */
  dvgs_guard_sigmas: number;
  sets: ProposedSet[];
  total_cost: number;
  guarantee: { kind: 'exact' | 'heuristic'; note: string };
  /** How many sets (capped at the count asked) the same stock gives with looser tolerances. */
  looser: {
    all_times_1_5: number;
    all_times_2: number;
    only_one_times_2: { max_dvgs_v: number; max_gm_mismatch: number; max_idss_mismatch: number; cascode_margin_v: number };
  };
  candidates: { in_stock: number; considered: number; unusable: Record<string, number> };
  /** Set once the proposal was confirmed. */
  reservation_id: string | null;
  /** Server time spent on the request (ms), when the proposal was just made. */
  server_ms?: number;
}
