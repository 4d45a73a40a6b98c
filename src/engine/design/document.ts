// The design document as stored in files, IndexedDB and share links.
// Field names carry their unit; the engine converts to SI once, in `toSystem`.

export const DESIGN_FORMAT = 'preheard-design';
export const DESIGN_VERSION = 1;

export interface DriverDoc {
  name?: string;
  fs_hz?: number;
  qes?: number;
  qms?: number;
  vas_l?: number;
  re_ohm: number;
  le_mh?: number;
  sd_cm2: number;
  bl_tm?: number;
  mms_g?: number;
  cms_mm_per_n?: number;
  rms_kg_s?: number;
  xmax_mm: number;
  xlim_mm?: number;
  pe_w: number;
  /** Bl(x) = Bl(0)·(1 + c1·x + c2·x^2 + ...), x in mm, outward positive. */
  bl_rel_per_mm?: number[];
  /** Suspension stiffness Kms(x) = Kms(0)·(1 + c1·x + ...); the box stiffness stays separate. */
  kms_rel_per_mm?: number[];
  le_rel_per_mm?: number[];
  rtv_k_per_w?: number;
  ctv_j_per_k?: number;
  rtm_k_per_w?: number;
  ctm_j_per_k?: number;
  coil_material?: 'copper' | 'aluminium';
  coil_max_c?: number;
}

export interface PortDoc {
  /** Round port: inner diameter. */
  diameter_cm?: number;
  /** Slot port: inner width and height. */
  width_cm?: number;
  height_cm?: number;
  count?: number;
  /** How the outer end meets the baffle: flush ('flanged', default) or protruding ('free'). */
  outer_end?: 'flanged' | 'free';
  inner_end?: 'flanged' | 'free';
}

export interface RadiatorDoc {
  sd_cm2: number;
  /** Moving mass including any added mass. */
  mmp_g: number;
  cmp_mm_per_n: number;
  qmp?: number | null;
  xmax_mm: number;
  count?: number;
}

export type BoxDoc =
  | { type: 'sealed'; vb_l: number; ql?: number | null; fill?: number }
  | { type: 'vented'; vb_l: number; fb_hz: number; ql?: number | null; ports: PortDoc[] }
  | { type: 'passive-radiator'; vb_l: number; ql?: number | null; radiator: RadiatorDoc };

export interface AmplifierDoc {
  power_w: number;
  load_ohm: number;
  rs_ohm?: number;
  clip?: 'hard' | 'soft';
}

export interface CrossoverDoc {
  type: 'lr2' | 'lr4' | 'lr8' | 'none';
  fx_hz?: number;
  /** Subsonic protection before the amplifier: a 2nd-order Butterworth high-pass; 0 or absent = none. */
  highpass_hz?: number;
}

export type PlannedLevelDoc =
  /** Long-term average C-weighted SPL at the seat. */
  | { mode: 'spl'; spl_db: number }
  /** Amplifier peak output voltage for a digital full-scale sample. */
  | { mode: 'volts'; volts_fs: number };

export interface ListeningDoc {
  distance_m: number;
  space: 'full' | 'half' | 'quarter' | 'eighth';
  channels?: 'pair' | 'mono-sum';
  level?: PlannedLevelDoc;
  /** Small room or car cabin gain: a rising 12 dB/octave slope below the corner. 0 = off. */
  room_gain_hz?: number;
  /** Baffle width of a free-standing cabinet: the response steps up 6 dB around 115/width. 0 = off. */
  baffle_width_cm?: number;
}

export interface AirDoc {
  temperature_c?: number;
  pressure_kpa?: number;
}

export interface DesignDoc {
  format: typeof DESIGN_FORMAT;
  version: typeof DESIGN_VERSION;
  name: string;
  notes?: string;
  driver: DriverDoc;
  box: BoxDoc;
  amplifier: AmplifierDoc;
  crossover: CrossoverDoc;
  listening: ListeningDoc;
  air?: AirDoc;
}
