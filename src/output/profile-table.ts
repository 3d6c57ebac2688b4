// A strip's profile as a CSV table for other reports, and the name its files take.
import type { Profile } from '../screening/profile.js';
import { roundNumber } from './format.js';

/** A strip id as part of a file name: letters, digits, dot, dash and underscore only. */
export function safeId(stripId: string): string {
  return stripId.replace(/[^A-Za-z0-9._-]/g, '_').slice(0, 120);
}

export function profileFileName(stripId: string): string {
  return `profile-${safeId(stripId)}`;
}

/** The profile's samples: x_m (from the strip's line a), water_table_m, ground_m, base_m; 6 significant digits. */
export function profileTable(profile: Profile): string {
  const rows = ['x_m,water_table_m,ground_m,base_m'];
  const base = roundNumber(profile.baseM);
  for (let i = 0; i < profile.xM.length; i++) {
    rows.push(`${roundNumber(profile.xM[i])},${roundNumber(profile.waterTableM[i])},${roundNumber(profile.groundM[i])},${base}`);
  }
  return `${rows.join('\n')}\n`;
}
