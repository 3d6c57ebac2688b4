// How to read the user's attributes: which attribute holds each of doab's fields, in which unit,
// and the defaults for what a feature leaves out. The config file's `fields`, `units` and
// `defaults` sections fill this in.
import type { ConductivityUnit, LengthUnit, RechargeUnit } from './units.js';

export interface LineFields {
  id: string;
  kind: string;
  name: string;
  stage: string;
  stageStart: string;
  stageEnd: string;
  /** Optional: the bed's resistance to seepage, days (the clogging layer's thickness over its conductivity). */
  bedResistance: string;
  /** Optional: the wetted perimeter (length unit of elevations). */
  wettedPerimeter: string;
  /** Optional, for the wetted perimeter when none is given: bottom width and water depth (length unit of elevations). */
  bottomWidth: string;
  waterDepth: string;
}

export interface ZoneFields {
  id: string;
  k: string;
  base: string;
  ground: string;
  recharge: string;
  /** Optional: the head held along the zone's part of the aquifer's outer edge (elevation). */
  edgeHead: string;
  /** Optional, for the spread from uncertain K: a range (P10 and P90, unit of K), or the standard deviation of ln K. */
  kLow: string;
  kHigh: string;
  kLogSd: string;
}

export interface WellFields {
  id: string;
  /** The observed water-table elevation (length unit of elevations). */
  observed: string;
  /** Optional: the reading's date, kept as given. */
  date: string;
}

export interface InputRules {
  fields: { lines: LineFields; zones: ZoneFields; wells: WellFields };
  units: { k: ConductivityUnit; recharge: RechargeUnit; elevation: LengthUnit };
  defaults: {
    /** Kind of a line without one. */
    kind: 'canal' | 'drain';
    /** Recharge of a zone without one, in units.recharge. */
    recharge: number;
    /** Bed resistance of a line without one (days); 0 is a clean bed. */
    bedResistanceD: number;
    /** Wetted perimeter of a line with a bed resistance that gives none (m); null: such a line is an error. */
    wettedPerimeterM: number | null;
    /** Side slope of a channel, horizontal over vertical, for the wetted perimeter from bottom width and water depth. */
    bankSlope: number;
  };
  /** The user's words for canal and drain in the kind attribute (compared without case). */
  kindWords: { canal: string[]; drain: string[] };
}

export const DEFAULT_RULES: InputRules = {
  fields: {
    lines: {
      id: 'id', kind: 'kind', name: 'name', stage: 'stage_m', stageStart: 'stage_start_m', stageEnd: 'stage_end_m',
      bedResistance: 'bed_resistance_d', wettedPerimeter: 'wetted_perimeter_m', bottomWidth: 'bottom_width_m', waterDepth: 'water_depth_m',
    },
    zones: { id: 'id', k: 'k_m_d', base: 'base_m', ground: 'ground_m', recharge: 'recharge_mm_yr', edgeHead: 'edge_head_m', kLow: 'k_low_m_d', kHigh: 'k_high_m_d', kLogSd: 'k_log_sd' },
    wells: { id: 'id', observed: 'water_table_m', date: 'date' },
  },
  units: { k: 'm/d', recharge: 'mm/yr', elevation: 'm' },
  // a side slope of 1.5 horizontal to 1 vertical is usual for earth canals in sandy soils (common practice, from memory)
  defaults: { kind: 'canal', recharge: 0, bedResistanceD: 0, wettedPerimeterM: null, bankSlope: 1.5 },
  kindWords: { canal: ['canal'], drain: ['drain'] },
};

export function cloneRules(rules: InputRules): InputRules {
  return {
    fields: { lines: { ...rules.fields.lines }, zones: { ...rules.fields.zones }, wells: { ...rules.fields.wells } },
    units: { ...rules.units },
    defaults: { ...rules.defaults },
    kindWords: { canal: [...rules.kindWords.canal], drain: [...rules.kindWords.drain] },
  };
}
