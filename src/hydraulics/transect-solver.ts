// Steady Dupuit-Forchheimer flow in an unconfined aquifer on a horizontal base, across one
// transect from line a (x = 0) to line b (x = L), through zones in series with areal recharge.
//
// With u = h^2 (h = saturated thickness above the base) the flow equation (K/2) u'' + N = 0 is
// linear in u (W.W. Woessner and E.P. Poeter (2020), Hydrogeologic Properties of Earth Materials
// and Principles of Groundwater Flow, section 7.3). Inside zone j of length l, measured by t from
// its left edge, with U_j, U_j+1 the values of u at its edges and c = N/K:
//   u(t) = U_j + (U_j+1 - U_j) t / l + c t (l - t)
//   q(t) = -(K/2) du/dt = -(K/2)(U_j+1 - U_j)/l - N l/2 + N t        (flow towards +x)
// u and q are continuous across zone edges, which gives a symmetric tridiagonal system in the
// interior edge values, solved here exactly in O(zones) with the Thomas algorithm.
//
// The solver keeps its inputs, scratch and results in typed arrays sized once, so a solve
// allocates nothing: it runs in the inner loop of every transect of a district.

export const SOLVE_OK = 0;
export const SOLVE_NON_FINITE = 1;
export const SOLVE_NO_ZONES = 2;
export const SOLVE_NON_POSITIVE_LENGTH = 3;
export const SOLVE_NON_POSITIVE_K = 4;
export const SOLVE_STAGE_AT_OR_BELOW_BASE = 5;
export const SOLVE_AQUIFER_DRIES = 6;
export const SOLVE_BED_NOT_CONVERGED = 7;
/** Set by the caller, not by solve(): the transect's ground is known nowhere (no DEM data, no zone ground), so no depth. */
export const SOLVE_NO_GROUND = 8;

export const SOLVE_STATUS_NAMES = [
  'ok',
  'non-finite-input',
  'no-zones',
  'non-positive-length',
  'non-positive-conductivity',
  'stage-at-or-below-base',
  'aquifer-dries',
  'bed-solve-failed',
  'no-ground',
] as const;
export type SolveStatusName = (typeof SOLVE_STATUS_NAMES)[number];


/** Newton steps allowed for the bank heads where a bed resists (it takes a handful). */
const MAX_BED_ITERATIONS = 100;

export class TransectSolver {
  readonly maxZones: number;
  /** Inputs per zone, filled by the caller before `solve`, in order from line a. */
  readonly lengthM: Float64Array;
  readonly kMPerDay: Float64Array;
  readonly rechargeMPerDay: Float64Array;
  readonly groundM: Float64Array;
  /**
   * The lines' beds, set by the caller before `solve`: the conductance of the bed on this side,
   * per metre of line (m/d; the side's share of the wetted perimeter over the bed resistance), and
   * the elevation of the bed's underside (m). Infinity (a clean bed: the line holds the bank at its
   * stage) and -Infinity (no underside known) by default. Seepage into this side is
   * conductance x (stage - max(bank head, underside)).
   */
  ownBedConductanceMPerDay = Infinity;
  partnerBedConductanceMPerDay = Infinity;
  ownBedFloorM = -Infinity;
  partnerBedFloorM = -Infinity;

  /** u = h^2 (m^2) at zone edges, and the edges' distance from line a (m). */
  readonly uEdgeM2: Float64Array;
  readonly xEdgeM: Float64Array;
  private readonly scratchC: Float64Array;
  private readonly scratchD: Float64Array;
  private readonly zoneIntegral = new Float64Array(1);

  // Results of the last successful solve.
  zoneCount = 0;
  baseM = 0;
  transectLengthM = 0;
  /** Seepage per metre of line (m^2/d); positive when that line loses water to the aquifer. */
  ownSeepageM2PerDay = NaN;
  partnerSeepageM2PerDay = NaN;
  /** Highest water table: elevation (m) and distance from line a (m); it may sit at a line. */
  peakWaterTableM = NaN;
  peakOffsetM = NaN;
  /** Where the flow divides (q = 0) inside the transect, or NaN when it does not. */
  divideOffsetM = NaN;
  /** Smallest depth of the water table below ground (m; negative when above ground). */
  minDepthM = NaN;
  minDepthOffsetM = NaN;
  meanThicknessM = NaN;
  /** L / mean saturated thickness; Dupuit-Forchheimer is fair when at least about 5 (common practice). */
  dupuitRatio = NaN;
  /** seepage a + seepage b + sum(N l): zero up to rounding when the solve is right (m^2/d). */
  massResidualM2PerDay = NaN;
  /** Zone where the last failed solve found its problem, or -1. */
  failedZone = -1;
  /** Water table at each bank (m): the stage for a clean bed, below it where a losing line's bed resists. */
  ownBankHeadM = NaN;
  partnerBankHeadM = NaN;
  /** Newton iterations the beds took (0 for clean beds). */
  bedIterations = 0;
  /** Largest |seepage through the bed - seepage into the aquifer| at the banks (m^2/d); 0 for clean beds. */
  bedResidualM2PerDay = 0;

  constructor(maxZones = 64) {
    if (!(maxZones >= 1)) throw new Error(`Unexpected maxZones value: ${maxZones}.`);
    this.maxZones = maxZones;
    this.lengthM = new Float64Array(maxZones);
    this.kMPerDay = new Float64Array(maxZones);
    this.rechargeMPerDay = new Float64Array(maxZones);
    this.groundM = new Float64Array(maxZones);
    this.uEdgeM2 = new Float64Array(maxZones + 1);
    this.xEdgeM = new Float64Array(maxZones + 1);
    this.scratchC = new Float64Array(maxZones + 1);
    this.scratchD = new Float64Array(maxZones + 1);
  }

  /** Solves for the first `zoneCount` zones; returns SOLVE_OK or the reason it cannot. */
  solve(ownStageM: number, partnerStageM: number, baseM: number, zoneCount: number): number {
    this.failedZone = -1;
    this.ownSeepageM2PerDay = this.partnerSeepageM2PerDay = NaN;
    if (!(zoneCount >= 1 && zoneCount <= this.maxZones)) return SOLVE_NO_ZONES;
    if (!Number.isFinite(ownStageM) || !Number.isFinite(partnerStageM) || !Number.isFinite(baseM)) return SOLVE_NON_FINITE;
    const { lengthM, kMPerDay, rechargeMPerDay, groundM, uEdgeM2, xEdgeM } = this;
    let x = 0;
    xEdgeM[0] = 0;
    for (let j = 0; j < zoneCount; j++) {
      const l = lengthM[j], k = kMPerDay[j], n = rechargeMPerDay[j], g = groundM[j];
      this.failedZone = j;
      // ground plays no part in the flow: NaN (not known: a DEM gives it) is allowed, and gives NaN depths
      if (!Number.isFinite(l) || !Number.isFinite(k) || !Number.isFinite(n) || (!Number.isFinite(g) && !Number.isNaN(g))) return SOLVE_NON_FINITE;
      if (!(l > 0)) return SOLVE_NON_POSITIVE_LENGTH;
      if (!(k > 0)) return SOLVE_NON_POSITIVE_K;
      x += l;
      xEdgeM[j + 1] = x;
    }
    this.failedZone = -1;
    if (!(ownStageM > baseM) || !(partnerStageM > baseM)) return SOLVE_STAGE_AT_OR_BELOW_BASE;

    const h0 = ownStageM - baseM, hL = partnerStageM - baseM;
    this.bedIterations = 0;
    this.bedResidualM2PerDay = 0;
    const ownC = this.ownBedConductanceMPerDay, partnerC = this.partnerBedConductanceMPerDay;
    if (!(ownC > 0) || !(partnerC > 0) || Number.isNaN(this.ownBedFloorM) || Number.isNaN(this.partnerBedFloorM)) return SOLVE_NON_FINITE;
    if (ownC === Infinity && partnerC === Infinity) {
      uEdgeM2[0] = h0 * h0;
      uEdgeM2[zoneCount] = hL * hL;
    } else {
      const banks = this.solveBanks(h0, hL, baseM, zoneCount);
      if (banks !== SOLVE_OK) return banks;
    }
    this.solveInteriorEdges(zoneCount);

    this.zoneCount = zoneCount;
    this.baseM = baseM;
    this.transectLengthM = x;

    // Flux towards +x at the a end of zone 0 and at the b end of the last zone.
    const q0 = this.fluxAtA(zoneCount), qL = this.fluxAtB(zoneCount);
    this.ownSeepageM2PerDay = q0;
    this.partnerSeepageM2PerDay = -qL;
    this.ownBankHeadM = baseM + Math.sqrt(Math.max(uEdgeM2[0], 0));
    this.partnerBankHeadM = baseM + Math.sqrt(Math.max(uEdgeM2[zoneCount], 0));
    if (ownC !== Infinity || partnerC !== Infinity) {
      const bedA = ownC === Infinity ? q0 : ownC * (ownStageM - Math.max(this.ownBankHeadM, this.ownBedFloorM));
      const bedB = partnerC === Infinity ? -qL : partnerC * (partnerStageM - Math.max(this.partnerBankHeadM, this.partnerBedFloorM));
      this.bedResidualM2PerDay = Math.max(Math.abs(bedA - q0), Math.abs(bedB + qL));
    }
    let rechargeTotal = 0;
    for (let j = 0; j < zoneCount; j++) rechargeTotal += rechargeMPerDay[j] * lengthM[j];
    this.massResidualM2PerDay = q0 - qL + rechargeTotal;

    return this.scanProfile(zoneCount);
  }

  private fluxAtA(zoneCount: number): number {
    const l0 = this.lengthM[0];
    return (-this.kMPerDay[0] / (2 * l0)) * (this.uEdgeM2[1] - this.uEdgeM2[0]) - (this.rechargeMPerDay[0] * l0) / 2;
  }

  private fluxAtB(zoneCount: number): number {
    const last = zoneCount - 1, lN = this.lengthM[last];
    return (-this.kMPerDay[last] / (2 * lN)) * (this.uEdgeM2[zoneCount] - this.uEdgeM2[last]) + (this.rechargeMPerDay[last] * lN) / 2;
  }

  /**
   * Bank values of u where a bed resists: the seepage into the strip at each bank is affine in u
   * there (the problem inside is linear in u), and must equal what the bed passes,
   * C (H - max(h, floor)) with H and h thicknesses above the base. Newton on the two bank
   * thicknesses, from the clean-bed values, with steps cut to keep them positive. Leaves the bank
   * values in uEdgeM2[0] and uEdgeM2[zoneCount]. Where the banks head for the base (the beds cannot
   * pass what recharge takes out, or what a drain would draw) the aquifer dries.
   */
  private solveBanks(stageThicknessA: number, stageThicknessB: number, baseM: number, zoneCount: number): number {
    const u = this.uEdgeM2;
    // the seepage into the strip at a (fluxAtA) and at b (-fluxAtB), as p + pa ua + pb ub
    const seepage = (ua: number, ub: number): [number, number] => {
      u[0] = ua;
      u[zoneCount] = ub;
      this.solveInteriorEdges(zoneCount);
      return [this.fluxAtA(zoneCount), -this.fluxAtB(zoneCount)];
    };
    const [a0, b0] = seepage(0, 0);
    const [a1, b1] = seepage(1, 0);
    const [a2, b2] = seepage(0, 1);
    const pAA = a1 - a0, pBA = b1 - b0, pAB = a2 - a0, pBB = b2 - b0;
    const cA = this.ownBedConductanceMPerDay, cB = this.partnerBedConductanceMPerDay;
    const floorA = this.ownBedFloorM - baseM, floorB = this.partnerBedFloorM - baseM;
    let hA = stageThicknessA, hB = stageThicknessB;
    // the scale of the fluxes, for the stopping test
    const scale = Math.abs(a0) + Math.abs(b0) + Math.abs(pAA) * hA * hA + Math.abs(pBB) * hB * hB + Math.abs(pAB) * hB * hB + Math.abs(pBA) * hA * hA;
    for (let iteration = 1; iteration <= MAX_BED_ITERATIONS; iteration++) {
      const intoA = a0 + pAA * hA * hA + pAB * hB * hB, intoB = b0 + pBA * hA * hA + pBB * hB * hB;
      // a clean bed holds its bank at the stage: its equation is h = H
      const fA = cA === Infinity ? hA - stageThicknessA : intoA - cA * (stageThicknessA - Math.max(hA, floorA));
      const fB = cB === Infinity ? hB - stageThicknessB : intoB - cB * (stageThicknessB - Math.max(hB, floorB));
      const jAA = cA === Infinity ? 1 : 2 * pAA * hA + (hA > floorA ? cA : 0), jAB = cA === Infinity ? 0 : 2 * pAB * hB;
      const jBA = cB === Infinity ? 0 : 2 * pBA * hA, jBB = cB === Infinity ? 1 : 2 * pBB * hB + (hB > floorB ? cB : 0);
      const det = jAA * jBB - jAB * jBA;
      if (!(Math.abs(det) > 0) || !Number.isFinite(det)) return this.bankFailure(hA, hB, stageThicknessA, stageThicknessB);
      let dA = -(fA * jBB - fB * jAB) / det, dB = -(jAA * fB - jBA * fA) / det;
      // keep both thicknesses positive: never more than nine tenths of the way to zero
      const cut = Math.min(1, dA < 0 ? (-0.9 * hA) / dA : 1, dB < 0 ? (-0.9 * hB) / dB : 1);
      dA *= cut;
      dB *= cut;
      hA += dA;
      hB += dB;
      this.bedIterations = iteration;
      const tolerance = 1e-14 * (scale + (cA === Infinity ? 0 : cA * stageThicknessA) + (cB === Infinity ? 0 : cB * stageThicknessB));
      if (Math.abs(fA) <= tolerance && Math.abs(fB) <= tolerance && cut === 1) break;
      if (Math.abs(dA) <= 1e-13 * hA && Math.abs(dB) <= 1e-13 * hB && cut === 1) break;
      if (iteration === MAX_BED_ITERATIONS) return this.bankFailure(hA, hB, stageThicknessA, stageThicknessB);
    }
    if (!(hA > 0) || !(hB > 0)) return this.bankFailure(hA, hB, stageThicknessA, stageThicknessB);
    u[0] = hA * hA;
    u[zoneCount] = hB * hB;
    return SOLVE_OK;
  }

  /** Why the banks did not settle: a bank driven to the base is a drying aquifer; anything else the bed solve's own failure. */
  private bankFailure(hA: number, hB: number, stageThicknessA: number, stageThicknessB: number): number {
    const dry = !(hA > 1e-3 * stageThicknessA) || !(hB > 1e-3 * stageThicknessB);
    return dry ? SOLVE_AQUIFER_DRIES : SOLVE_BED_NOT_CONVERGED;
  }

  // Thomas algorithm on (a_j-1 + a_j) U_j - a_j-1 U_j-1 - a_j U_j+1 = N_j-1 l_j-1 + N_j l_j, a = K/l.
  private solveInteriorEdges(zoneCount: number): void {
    const { lengthM, kMPerDay, rechargeMPerDay, uEdgeM2, scratchC, scratchD } = this;
    const unknowns = zoneCount - 1;
    if (unknowns === 0) return;
    for (let i = 1; i <= unknowns; i++) {
      const aLeft = kMPerDay[i - 1] / lengthM[i - 1];
      const aRight = kMPerDay[i] / lengthM[i];
      let rhs = rechargeMPerDay[i - 1] * lengthM[i - 1] + rechargeMPerDay[i] * lengthM[i];
      let diag = aLeft + aRight;
      if (i === 1) rhs += aLeft * uEdgeM2[0];
      else {
        // eliminate U_i-1 with the previous row (its upper coefficient is -aLeft)
        diag -= aLeft * scratchC[i - 1];
        rhs += aLeft * scratchD[i - 1];
      }
      if (i === unknowns) rhs += aRight * uEdgeM2[zoneCount];
      scratchC[i] = aRight / diag;
      scratchD[i] = rhs / diag;
    }
    uEdgeM2[unknowns] = scratchD[unknowns];
    for (let i = unknowns - 1; i >= 1; i--) uEdgeM2[i] = scratchD[i] + scratchC[i] * uEdgeM2[i + 1];
  }

  // Peak, divide, driest point, smallest depth and mean thickness, zone by zone.
  private scanProfile(zoneCount: number): number {
    const { lengthM, kMPerDay, rechargeMPerDay, groundM, uEdgeM2, xEdgeM } = this;
    let peakU = -Infinity, peakX = 0;
    let thicknessIntegral = 0;
    this.divideOffsetM = NaN;
    for (let j = 0; j < zoneCount; j++) {
      const l = lengthM[j], c = rechargeMPerDay[j] / kMPerDay[j];
      const uLeft = uEdgeM2[j], uRight = uEdgeM2[j + 1], slope = (uRight - uLeft) / l;
      let zoneMaxU = uLeft, zoneMaxT = 0, zoneMinU = uLeft;
      if (uRight > zoneMaxU) { zoneMaxU = uRight; zoneMaxT = l; }
      if (uRight < zoneMinU) zoneMinU = uRight;
      if (c !== 0) {
        // du/dt = slope + c l - 2 c t vanishes at the divide
        const tStar = l / 2 + slope / (2 * c);
        if (tStar > 0 && tStar < l) {
          const uStar = uLeft + slope * tStar + c * tStar * (l - tStar);
          if (c > 0 && uStar > zoneMaxU) { zoneMaxU = uStar; zoneMaxT = tStar; }
          if (c < 0 && uStar < zoneMinU) zoneMinU = uStar;
          this.divideOffsetM = xEdgeM[j] + tStar;
        }
      }
      if (zoneMinU <= 0) { this.failedZone = j; this.ownSeepageM2PerDay = this.partnerSeepageM2PerDay = NaN; return SOLVE_AQUIFER_DRIES; }
      if (zoneMaxU > peakU) { peakU = zoneMaxU; peakX = xEdgeM[j] + zoneMaxT; }
      this.integrateThickness(j);
      thicknessIntegral += this.zoneIntegral[0];
    }
    this.peakWaterTableM = this.baseM + Math.sqrt(peakU);
    this.peakOffsetM = peakX;
    this.meanThicknessM = thicknessIntegral / this.transectLengthM;
    this.dupuitRatio = this.transectLengthM / this.meanThicknessM;
    this.scanDepth(0);
    // every zone's lowest u was checked above, so the aquifer holds water throughout
    return SOLVE_OK;
  }

  /**
   * Sets minDepthM and minDepthOffsetM over the land between the lines, leaving out marginM
   * beside each line (its banks); solve() calls it with no margin.
   */
  scanDepth(marginM: number): void {
    const { lengthM, kMPerDay, rechargeMPerDay, groundM, uEdgeM2, xEdgeM } = this;
    const from = Math.min(Math.max(marginM, 0), this.transectLengthM / 2), to = this.transectLengthM - from;
    let minDepth = Infinity, minDepthX = NaN;
    for (let j = 0; j < this.zoneCount; j++) {
      const l = lengthM[j], c = rechargeMPerDay[j] / kMPerDay[j];
      const t0 = Math.max(from - xEdgeM[j], 0), t1 = Math.min(to - xEdgeM[j], l);
      if (t1 < t0) continue;
      const uLeft = uEdgeM2[j], slope = (uEdgeM2[j + 1] - uLeft) / l;
      // the highest water table of the zone's part gives its smallest depth
      let bestT = t0, bestU = uLeft + slope * t0 + c * t0 * (l - t0);
      const u1 = uLeft + slope * t1 + c * t1 * (l - t1);
      if (u1 > bestU) { bestU = u1; bestT = t1; }
      if (c > 0) {
        const tStar = l / 2 + slope / (2 * c);
        if (tStar > t0 && tStar < t1) {
          const uStar = uLeft + slope * tStar + c * tStar * (l - tStar);
          if (uStar > bestU) { bestU = uStar; bestT = tStar; }
        }
      }
      const depth = groundM[j] - (this.baseM + Math.sqrt(Math.max(bestU, 0)));
      if (depth < minDepth) { minDepth = depth; minDepthX = xEdgeM[j] + bestT; }
    }
    // no zone knows its ground (NaN: a DEM gives it): no depth
    this.minDepthM = Number.isFinite(minDepth) ? minDepth : NaN;
    this.minDepthOffsetM = minDepthX;
  }

  // Integral of sqrt(u) over zone j, u(t) = a t^2 + b t + c with a = -N/K: the saturated thickness
  // over the zone, by the closed forms (I.S. Gradshteyn and I.M. Ryzhik, Table of Integrals, 2.262
  // [from memory]; each checked here by differentiation). Their two terms cancel as the curvature a
  // vanishes, losing about eps * u / (a l^2) relative; below 1e-7 of u the linear form is exact to
  // that order instead. Written into a typed array, not returned, and with both ends in one loop,
  // so that no number is boxed on the heap.
  private integrateThickness(j: number): void {
    const l = this.lengthM[j], a = -this.rechargeMPerDay[j] / this.kMPerDay[j];
    const c = this.uEdgeM2[j], uEnd = this.uEdgeM2[j + 1];
    const b = (uEnd - c) / l - a * l;
    if (Math.abs(a) * l * l < 1e-7 * Math.max(c, uEnd)) {
      // u along its chord: sqrt(c + m t) integrates exactly (its slope m, not the tangent's b,
      // which differs by a l and would not meet uEnd)
      const rise = uEnd - c, ratio = rise / c;
      const end = Math.max(uEnd, 0);
      this.zoneIntegral[0] = Math.abs(ratio) < 1e-6 ? Math.sqrt(c) * l * (1 + ratio / 4) : ((2 * l) / (3 * rise)) * (end * Math.sqrt(end) - c * Math.sqrt(c));
      return;
    }
    const disc = b * b - 4 * a * c;
    let total = 0;
    for (let end = 0; end < 2; end++) {
      const t = end === 0 ? 0 : l, sign = end === 0 ? -1 : 1;
      const root = Math.sqrt(Math.max((a * t + b) * t + c, 0)), lin = 2 * a * t + b;
      let value = (lin * root) / (4 * a);
      if (a > 0) {
        // ln|2 sqrt(a) root + lin|; where lin < 0 the two terms cancel, so use the conjugate:
        // (2 sqrt(a) root + lin)(2 sqrt(a) root - lin) = -disc
        const logTerm = lin >= 0 ? Math.log(2 * Math.sqrt(a) * root + lin) : Math.log(Math.abs(disc)) - Math.log(2 * Math.sqrt(a) * root - lin);
        value -= (disc / (8 * a * Math.sqrt(a))) * logTerm;
      } else {
        // disc > 0 whenever u > 0 somewhere. asin(x) is ill-conditioned as |x| nears 1, so take
        // 1 - |x| = -4 a u / (sqrt(disc) (sqrt(disc) + |lin|)) without cancellation and use
        // asin(|x|) = pi/2 - 2 asin(sqrt((1 - |x|) / 2)).
        const rootDisc = Math.sqrt(Math.max(disc, 0));
        const gap = (-4 * a * root * root) / (rootDisc * (rootDisc + Math.abs(lin)));
        const angle = Math.PI / 2 - 2 * Math.asin(Math.min(Math.sqrt(Math.max(gap, 0) / 2), 1));
        value += (disc / (8 * a * Math.sqrt(-a))) * (lin >= 0 ? angle : -angle);
      }
      total += sign * value;
    }
    this.zoneIntegral[0] = total;
  }

  private zoneAt(xM: number): number {
    const { xEdgeM, zoneCount } = this;
    let j = 0;
    while (j < zoneCount - 1 && xM > xEdgeM[j + 1]) j++;
    return j;
  }

  /** u = h^2 (m^2) at distance xM from line a, after a successful solve. */
  uAt(xM: number): number {
    const j = this.zoneAt(xM);
    const l = this.lengthM[j], c = this.rechargeMPerDay[j] / this.kMPerDay[j];
    const t = Math.min(Math.max(xM - this.xEdgeM[j], 0), l);
    const uLeft = this.uEdgeM2[j];
    return uLeft + ((this.uEdgeM2[j + 1] - uLeft) / l) * t + c * t * (l - t);
  }

  /** Water-table elevation (m) at distance xM from line a. */
  headAt(xM: number): number {
    return this.baseM + Math.sqrt(Math.max(this.uAt(xM), 0));
  }

  /** Flow per metre towards line b (m^2/d) at distance xM from line a. */
  fluxAt(xM: number): number {
    const j = this.zoneAt(xM);
    const l = this.lengthM[j], k = this.kMPerDay[j], n = this.rechargeMPerDay[j];
    const t = Math.min(Math.max(xM - this.xEdgeM[j], 0), l);
    return (-k / (2 * l)) * (this.uEdgeM2[j + 1] - this.uEdgeM2[j]) - (n * l) / 2 + n * t;
  }

  /** Ground elevation (m) at distance xM from line a. */
  groundAt(xM: number): number {
    return this.groundM[this.zoneAt(xM)];
  }

  /**
   * Length of the transect (m) where the water table is less than depthM below ground, leaving
   * out marginM beside each line (its banks).
   */
  shallowLengthM(depthM: number, marginM = 0): number {
    const from = Math.min(Math.max(marginM, 0), this.transectLengthM / 2), to = this.transectLengthM - from;
    let total = 0;
    for (let j = 0; j < this.zoneCount; j++) {
      const l = this.lengthM[j], c = this.rechargeMPerDay[j] / this.kMPerDay[j];
      const t0 = Math.max(from - this.xEdgeM[j], 0), t1 = Math.min(to - this.xEdgeM[j], l);
      if (!(t1 > t0)) continue;
      const limitThickness = this.groundM[j] - depthM - this.baseM;
      if (limitThickness <= 0) { total += t1 - t0; continue; }
      // u(t) - s^2 = -c t^2 + (slope + c l) t + (U_j - s^2) > 0 on part of [t0, t1]
      const slope = (this.uEdgeM2[j + 1] - this.uEdgeM2[j]) / l;
      total += positiveMeasure(-c, slope + c * l, this.uEdgeM2[j] - limitThickness * limitThickness, t0, t1);
    }
    return total;
  }
}

// Measure of {t in [t0, t1] : a t^2 + b t + c > 0}, without allocating.
function positiveMeasure(a: number, b: number, c: number, t0: number, t1: number): number {
  const l = t1;
  let r1 = NaN, r2 = NaN;
  const scale = Math.abs(b) * l + Math.abs(c);
  if (Math.abs(a) * l * l <= 1e-14 * scale) {
    if (b !== 0) r1 = -c / b;
  } else {
    const disc = b * b - 4 * a * c;
    if (disc > 0) {
      // the stable form avoids cancellation between b and the root of the discriminant
      const qq = -0.5 * (b + Math.sign(b || 1) * Math.sqrt(disc));
      r1 = qq / a;
      r2 = qq !== 0 ? c / qq : NaN;
      if (r2 < r1) { const s = r1; r1 = r2; r2 = s; }
    }
  }
  let total = 0, from = t0;
  for (let k = 0; k < 3; k++) {
    const r = k === 0 ? r1 : k === 1 ? r2 : l;
    if (!(r > from)) continue;
    const to = Math.min(r, l);
    const mid = (from + to) / 2;
    if ((a * mid + b) * mid + c > 0) total += to - from;
    from = to;
    if (from >= l) break;
  }
  return total;
}
