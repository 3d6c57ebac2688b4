// A small branching district of our own for the district solve's tests: a main canal with two
// offtakes (one square to it, one at 45 degrees) whose tails end inside the district, a drain along
// the south edge with a drain joining it at a T, and two zones with different K and recharge.
// Laid out in metres (see local-district.ts); every line's stage varies linearly, and where a line
// joins another it starts at that line's stage there (water levels meet at a junction: a jump would
// make the flow between the two lines grow without bound as the cell shrinks).
import { box, line } from './local-district.js';

/** The main canal's and the south drain's stage at a distance x (m) along them. */
const mainStageM = (x: number) => 105 - (0.4 * x) / 3000;
const southStageM = (x: number) => 98.2 - (0.4 * x) / 3000;

export const BRANCHING_LINES = [
  line('main', { kind: 'canal', stage_start_m: 105, stage_end_m: 104.6 }, [[0, 1500], [3000, 1500]]),
  line('offtake-90', { kind: 'canal', stage_start_m: mainStageM(800), stage_end_m: 104.2 }, [[800, 1500], [800, 500]]),
  line('offtake-45', { kind: 'canal', stage_start_m: mainStageM(1800), stage_end_m: 104.1 }, [[1800, 1500], [2500, 800]]),
  line('south-drain', { kind: 'drain', stage_start_m: 98.2, stage_end_m: 97.8 }, [[0, 100], [3000, 100]]),
  line('t-drain', { kind: 'drain', stage_start_m: 98.8, stage_end_m: southStageM(2800) }, [[2800, 1100], [2800, 100]]),
];

export const BRANCHING_ZONES = [
  box('west', { k_m_d: 8, base_m: 90, ground_m: 106.5, recharge_mm_yr: 100 }, [-200, 0, 1500, 2000]),
  box('east', { k_m_d: 20, base_m: 90, ground_m: 106, recharge_mm_yr: 200 }, [1500, 0, 3200, 2000]),
];
