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
}

export interface ZoneFields {
  id: string;
  k: string;
  base: string;
  ground: string;
  recharge: string;
  /** Optional: the head held along the zone's part of the aquifer's outer edge (elevation). */
  edgeHead: string;
}

export interface InputRules {
  fields: { lines: LineFields; zones: ZoneFields };
  units: { k: ConductivityUnit; recharge: RechargeUnit; elevation: LengthUnit };
  defaults: {
    /** Kind of a line without one. */
    kind: 'canal' | 'drain';
    /** Recharge of a zone without one, in units.recharge. */
    recharge: number;
  };
  /** The user's words for canal and drain in the kind attribute (compared without case). */
  kindWords: { canal: string[]; drain: string[] };
}

export const DEFAULT_RULES: InputRules = {
  fields: {
    lines: { id: 'id', kind: 'kind', name: 'name', stage: 'stage_m', stageStart: 'stage_start_m', stageEnd: 'stage_end_m' },
    zones: { id: 'id', k: 'k_m_d', base: 'base_m', ground: 'ground_m', recharge: 'recharge_mm_yr', edgeHead: 'edge_head_m' },
  },
  units: { k: 'm/d', recharge: 'mm/yr', elevation: 'm' },
  defaults: { kind: 'canal', recharge: 0 },
  kindWords: { canal: ['canal'], drain: ['drain'] },
};

export function cloneRules(rules: InputRules): InputRules {
  return {
    fields: { lines: { ...rules.fields.lines }, zones: { ...rules.fields.zones } },
    units: { ...rules.units },
    defaults: { ...rules.defaults },
    kindWords: { canal: [...rules.kindWords.canal], drain: [...rules.kindWords.drain] },
  };
}
