/**
 * The fracture surface's own edge (the notch root), chosen among the closed edges around the rough
 * core (rings.ts), instead of the silhouette of the part, which also holds a visible notch flank, a
 * shadow or a holder.
 *
 * Rules (our own, validated on the rendered scene sets; DEVELOPERS.md "Outline"):
 * - a ring "counts" when it is found on ≥ 60 % of the rays with prominence ≥ 0.3, or on ≥ 75 % when
 *   it is very round (RMS ≤ 1.5 px) with prominence ≥ 0.15;
 * - an annulus looks machined (turning marks of a notch flank) when it is ≥ 8 px wide and the radial
 *   share of its fine-texture gradients is ≥ 0.68 or its concentric profiles ≥ 0.6;
 * - the core edge is the innermost prominent ring on ≥ 50 % of the rays where the roughness drops
 *   outward by more than 0.8 (ln units) from about the core's own level: the rim/core boundary, or the
 *   outer edge itself on a surface without a band;
 * - walk outward from the core edge (else from the innermost counted ring) to the first ring beyond
 *   which lies a machined flank or background (outside the silhouette); from the core edge that takes
 *   a radial share ≥ 0.8 over ≥ 6 px or a silhouette share < 0.3 (rule `core-is-edge`, no band), else
 *   at most one step across the rim band (`first-edge-outside-core`); without a core edge at most two
 *   steps (`innermost-edge`, `edge-outside-inner-boundary`);
 * - a choice not confirmed by what lies outside it and without a core edge, or with another candidate
 *   further out, is ambiguous (OUTLINE_AMBIGUOUS), as is every step taken without a core edge;
 * - a much rounder ring just inside the chosen one is the same edge, the chosen one bent outward by a
 *   shadow: the twin is taken (`roundTwinInside`); the rings are then searched again on circles around
 *   the circle through the arcs where either is clear (`recentred`: the shadow pulled the centre vote),
 *   as they are when the inner trace was chosen directly beside its partner just outside it;
 * - with a section diameter given, the ring nearest it within 12 % wins — rule `section-diameter`;
 * - no ring chosen: the silhouette, with warning OUTLINE_FROM_SILHOUETTE.
 * Every ring is reported with its role and a note.
 */
import type { BoxPx, PointPx } from '../image/geometry.js';
import type { GrayRaster, Mask } from '../image/raster.js';
import { edgeCues, type EdgeCues } from './polar.js';
import { oncePerRaster } from './memo.js';
import { findRings, type Ring } from './rings.js';
import { voteCentre } from './centreVote.js';
import { silhouetteIsClean, type Specimen } from './specimen.js';
import { fitCircle } from './fit.js';

/** Edge cues per working copy (memo.ts). */
const CUES = new WeakMap<GrayRaster, Map<string, EdgeCues>>();

/** A ring with what the search made of it. */
export interface RingVerdict {
  ring: Ring;
  role: 'chosen' | 'candidate' | 'rejected';
  note: string;
}

/** Outcome of {@link findFractureEdge}. */
export interface FractureEdge {
  /** The chosen ring, or null (then the silhouette stands). */
  chosen: Ring | null;
  rule: string;
  rings: RingVerdict[];
  center: PointPx;
  /** A counted round ring lies inside the chosen one (not the core edge). */
  innerRoundEdge: boolean;
  /** More than one ring could be the edge and the cues do not single one out. */
  ambiguous: boolean;
  /** The section diameter was given and no ring lies within 12 % of it. */
  sectionNotFound: boolean;
  /** The ring first taken for the edge when a rounder twin just inside it replaced it (`roundTwinInside`), else null. */
  bent: Ring | null;
}

const MACHINED_RADIAL = 0.68;
const MACHINED_CONCENTRIC = 0.6;

function counts(r: Ring): boolean {
  return (r.coverage >= 0.6 && r.prominence >= 0.3) || (r.coverage >= 0.75 && r.roundnessPx <= 1.5 && r.prominence >= 0.15);
}

/** Machined-looking annulus (turning marks); an annulus narrower than 8 px (a narrow band between two edges) is too thin to tell. */
function machined(a: Ring['outer']): boolean {
  return a.widthPx >= 8 && (a.radialShare >= MACHINED_RADIAL || a.concentricity >= MACHINED_CONCENTRIC);
}

/** Roughness drops outward across it, from about the core's own level (not from a smooth band, nor from a machined flank inside it). */
function isCoreEdge(r: Ring, coreRoughness: number): boolean {
  return r.coverage >= 0.5 && r.prominence > 0 && r.inner.widthPx >= 4 && r.roughnessStep <= -0.8 && !(r.inner.roughness < coreRoughness - 0.6) && !machined(r.inner);
}

/**
 * A partial core edge: roughness drops outward across it by ≥ 0.5 on ≥ 30 % of the rays, from about
 * the core's level, no machined ring inside (sem-strip-noise-flank: the rim/core boundary under heavy
 * noise, 36 % of the rays, step −0.59).
 */
function isWeakCoreEdge(r: Ring, coreRoughness: number): boolean {
  return r.coverage >= 0.3 && r.prominence > 0 && r.inner.widthPx >= 4 && r.roughnessStep <= -0.5 && !(r.inner.roughness < coreRoughness - 0.6) && !machined(r.inner);
}

/** Options of {@link findFractureEdge}. */
export interface FractureEdgeOptions {
  /** Silhouette of the part (working px). */
  silhouette: Specimen;
  /** Net-section radius from the user, working px, or null. */
  sectionRadiusPx: number | null;
  /** The specimen's box when the frame holds several (working px): the search stays around it. */
  target?: BoxPx | null;
}

/**
 * Searches the closed edges around the core and chooses the fracture surface's own edge.
 * @param work - working copy (gray 0..1)
 */
export function findFractureEdge(work: GrayRaster, o: FractureEdgeOptions): FractureEdge {
  const W = work.width;
  const H = work.height;
  const windowPx = Math.max(5, Math.max(W, H) / 120);
  // the same for every specimen of the image (both halves): computed once
  const cues = oncePerRaster(CUES, work, String(windowPx), () => edgeCues(work, windowPx));
  return searchAround(cues, work, o);
}

function centreOf(cues: EdgeCues, W: number, H: number, sil: Specimen, t: BoxPx | null): { center: PointPx; silUsable: boolean; silGood: boolean; tSize: number } {
  const minSide = Math.min(W, H);
  const silUsable = sil.circle.cx >= 0 && sil.circle.cy >= 0 && sil.circle.cx < W && sil.circle.cy < H && sil.circle.radiusPx < 0.75 * Math.max(W, H);
  const near = t ? { x: t.x + t.w / 2, y: t.y + t.h / 2 } : silUsable ? { x: sil.circle.cx, y: sil.circle.cy } : { x: W / 2, y: H / 2 };
  const tSize = t ? Math.max(t.w, t.h) : Math.max(W, H);
  const silGood = silUsable && silhouetteIsClean(sil) && sil.ellipse.semiMinorPx < 0.95 * sil.ellipse.semiMajorPx;
  const center = silGood ? { x: sil.ellipse.cx, y: sil.ellipse.cy } : voteCentre(cues, 0.1 * minSide, 0.6 * minSide, near, t ? 0.3 * tSize : 0.45 * Math.max(W, H));
  return { center, silUsable, silGood, tSize };
}

function searchAround(cues: EdgeCues, work: GrayRaster, o: FractureEdgeOptions): FractureEdge {
  const W = work.width;
  const H = work.height;
  const sil = o.silhouette;
  const minSide = Math.min(W, H);
  const t = o.target ?? null;
  const { center, silUsable, silGood, tSize } = centreOf(cues, W, H, sil, t);
  const ratio = sil.ellipse.semiMajorPx > 0 ? Math.min(1, sil.ellipse.semiMinorPx / sil.ellipse.semiMajorPx) : 1;
  // a silhouette far off the voted centre (a holder or shadow merged with it) says nothing of the shape
  const offCentre = !silUsable || (!silGood && Math.hypot(center.x - sil.circle.cx, center.y - sil.circle.cy) > 0.08 * sil.circle.radiusPx);
  // a nearly round ellipse of a silhouette that is not clean (noise or a holder attached) is taken
  // for a circle: its few per cent of flattening are the attachment's, and they bend the grid (sem)
  // ("clean": little misfit and off the frame; silGood further asks for a clearly elliptic outline,
  // so a round clean silhouette such as a wobbly bar end keeps its own ellipse here)
  const silClean = silUsable && silhouetteIsClean(sil);
  const round = offCentre || !(ratio > 0.3) || (!silClean && ratio > 0.95);
  const shape = { center, ratio: round ? 1 : ratio, angleDeg: round ? 0 : -sil.ellipse.angleDeg };
  const R = silUsable ? sil.circle.radiusPx : 0.35 * minSide;
  const rMax = t ? 0.75 * tSize : Math.max(1.3 * R, 0.5 * Math.max(W, H));
  const rMin = 0.15 * Math.min(R, minSide / 2);
  const search = findRings(cues, shape, { rMin, rMax, silhouette: offCentre ? null : sil.mask });
  const first = choose(search.rings, center, o.sectionRadiusPx, search.coreRoughness);
  if (first.chosen) return recentred(cues, first, W, H, { rMin, rMax, silhouette: offCentre ? null : sil.mask }, o.sectionRadiusPx);
  // No closed edge on the first grid: the silhouette that shaped it may be merged with a holder or a
  // shadow (its ellipse then bends the grid), or a shadow pulled the centre vote off the edge. Look
  // again on circles around the voted centre, then around the circle through the covered arcs of
  // the clearest partial edge found so far; the silhouette is left out of these passes.
  let rings = search.rings;
  let last: PointPx | null = shape.ratio === 1 && shape.angleDeg === 0 && shape.center === center ? center : null;
  for (let pass = 0; pass < 3; pass++) {
    const c = pass === 0 && !last ? center : arcCentre(rings, W, H);
    if (!c || (last && Math.hypot(c.x - last.x, c.y - last.y) < 1)) {
      if (pass === 0 && last) continue;
      break;
    }
    const again = findRings(cues, { center: c, ratio: 1, angleDeg: 0 }, { rMin, rMax, silhouette: null });
    const found = choose(again.rings, c, o.sectionRadiusPx, again.coreRoughness);
    if (found.chosen) return recentred(cues, { ...found, rule: `${found.rule} (circles${c === center ? '' : ' through the covered arcs'})` }, W, H, { rMin, rMax, silhouette: null }, o.sectionRadiusPx);
    rings = again.rings;
    last = c;
  }
  return first;
}

/**
 * The edge found twice (a rounder twin taken for a ring bent outward by a shadow, `roundTwinInside`,
 * or the inner trace chosen directly beside its partner just outside, `partnerOutside`): the twin's
 * covered arcs and the bent ring's covered arcs where the twin is not covered are the same
 * edge, seen from a centre that the shadow pulled towards itself. On the lit side the twin cannot
 * reach the edge (its search band stops half-way to the bent ring) and the bent ring runs on it; on
 * the shadow side the twin runs on it and the bent ring follows the shadow. The circle through those
 * arcs re-centres the search: the rings are found again on circles around it, and that search is
 * taken when its chosen ring is the same edge (within max(2 px, 1 %) of the circle's radius), at least
 * as clear (coverage) and as round as the twin. External shadow_left: the vote was 5.5 px off towards
 * the shadow, the circle through the arcs is 0.1 px from the true centre, and the ring found around
 * it runs on the root on all rays (coverage 1.0, round to 0.5 px) where the twin covered 59 %.
 */
function recentred(cues: EdgeCues, fe: FractureEdge, W: number, H: number, ro: { rMin: number; rMax: number; silhouette: Mask | null }, sectionRadiusPx: number | null): FractureEdge {
  const inner = fe.chosen;
  const outer = inner ? fe.bent ?? partnerOutside(fe, inner) : null;
  if (!inner || !outer) return fe;
  const pts: PointPx[] = [];
  for (let t = 0; t < inner.covered.length; t++) {
    if (inner.covered[t]) pts.push(inner.points[t]);
    else if (outer.covered[t]) pts.push(outer.points[t]);
  }
  const c = pts.length >= 16 ? fitCircle(pts) : null;
  if (!c || !(c.cx >= 0 && c.cy >= 0 && c.cx < W && c.cy < H)) return fe;
  const shift = Math.hypot(c.cx - fe.center.x, c.cy - fe.center.y);
  // under a pixel the search would find the same rings; beyond 10 % of the radius, or arcs that miss
  // their circle by more than 1.5 px RMS, they are not one round edge
  if (shift < 1 || shift > 0.1 * inner.radiusPx || c.rmsResidualPx > 1.5) return fe;
  const centre = { x: c.cx, y: c.cy };
  const again = findRings(cues, { center: centre, ratio: 1, angleDeg: 0 }, ro);
  const found = choose(again.rings, centre, sectionRadiusPx, again.coreRoughness);
  const r = found.chosen;
  if (!r || Math.abs(r.radiusPx - c.radiusPx) > Math.max(2, 0.01 * c.radiusPx) || r.coverage < inner.coverage || r.roundnessPx > inner.roundnessPx) return fe;
  return { ...found, rule: `${found.rule} (circles around the edge found twice)` };
}

/**
 * The same edge found twice without the twin rule: the next counted ring just outside the chosen one
 * (gap ≤ max(4 px, 3 % of r)), clear on ≥ 15 % of the rays where the chosen ring is not, the chosen
 * ring being clear on < 90 %. A 1 px shift of shadow_left moves the vote so that the inner trace is
 * chosen directly (it has a core edge inside) and the outer one, on the root on the lit side, is
 * reported outside: −2.9 % with verdict OK before this.
 */
function partnerOutside(fe: FractureEdge, chosen: Ring): Ring | null {
  if (chosen.coverage >= 0.9) return null;
  const i = fe.rings.findIndex((v) => v.ring === chosen);
  const next = fe.rings[i + 1];
  if (i < 0 || !next || next.role !== 'candidate') return null;
  const gap = next.ring.radiusPx - chosen.radiusPx;
  if (!(gap > 0 && gap <= Math.max(4, 0.03 * chosen.radiusPx))) return null;
  let adds = 0;
  for (let t = 0; t < chosen.covered.length; t++) if (!chosen.covered[t] && next.ring.covered[t]) adds++;
  return adds >= 0.15 * chosen.covered.length ? next.ring : null;
}

/**
 * Centre of the circle through the covered arcs of the clearest partial edge (coverage ≥ 0.25, the
 * largest coverage × prominence), when those arcs lie in at least two quadrants (a quarter circle
 * leaves the centre poorly determined) and the circle stays within 10 % of the edge's radius; null
 * otherwise.
 */
function arcCentre(rings: Ring[], W: number, H: number): PointPx | null {
  let best: Ring | null = null;
  for (const r of rings) if (r.coverage >= 0.25 && r.prominence > 0 && (!best || r.coverage * r.prominence > best.coverage * best.prominence)) best = r;
  if (!best) return null;
  const n = best.covered.length;
  const pts: PointPx[] = [];
  const quadrants = new Set<number>();
  for (let t = 0; t < n; t++) {
    if (!best.covered[t]) continue;
    pts.push(best.points[t]);
    quadrants.add(Math.floor((4 * t) / n));
  }
  if (quadrants.size < 2 || pts.length < 16) return null;
  const c = fitCircle(pts);
  if (!c || !(c.cx >= 0 && c.cy >= 0 && c.cx < W && c.cy < H) || Math.abs(c.radiusPx - best.radiusPx) > 0.1 * best.radiusPx) return null;
  return { x: c.cx, y: c.cy };
}

function choose(rings: Ring[], center: PointPx, sectionRadiusPx: number | null, coreRoughness: number): FractureEdge {
  const verdicts: RingVerdict[] = rings.map((ring) => ({ ring, role: counts(ring) ? 'candidate' : 'rejected', note: counts(ring) ? 'closed round edge' : `weak or partial edge (found on ${Math.round(ring.coverage * 100)} % of the rays)` }));
  let chosen = -1;
  let rule = 'none';
  let sectionNotFound = false;
  if (sectionRadiusPx !== null) {
    let best = -1;
    for (let i = 0; i < rings.length; i++) {
      const d = Math.abs(rings[i].radiusPx - sectionRadiusPx) / sectionRadiusPx;
      if (d <= 0.12 && rings[i].coverage >= 0.3 && (best < 0 || d < Math.abs(rings[best].radiusPx - sectionRadiusPx) / sectionRadiusPx)) best = i;
    }
    if (best >= 0) {
      chosen = best;
      rule = 'section-diameter';
    } else sectionNotFound = true;
  }
  const core = rings.findIndex((r) => isCoreEdge(r, coreRoughness));
  if (core >= 0) verdicts[core].note = 'roughness drops outward across it: the rim/core boundary, or the edge of a surface without a band';
  let confirmed = rule === 'section-diameter';
  let twin = -1;
  // the ring the edge was first taken for, when a rounder twin just inside it replaced it
  let bent = -1;
  let stepped = false;
  if (chosen < 0) {
    // walk outward from the core edge (else the innermost clear ring) to the first ring beyond which
    // the surface is not fracture surface: a machined flank or the background; at most one step
    // across a rim band from the core edge, two without one
    // Without a core edge, a partial one inside the innermost clear ring (see isWeakCoreEdge: heavy
    // noise flattens the roughness step) still says that ring is the first edge outside the core;
    // so does the innermost clear ring itself when it is one (a light from high above fades the
    // core's texture: independent ring_high_flank.jpg, step −0.69 on every ray; taken as the first
    // clear ring, its smooth rim with beach marks outside it had read as a machined flank).
    const firstClear = rings.findIndex(counts);
    const weak = core < 0 && firstClear >= 0 ? rings.findIndex((r, k) => k <= firstClear && isWeakCoreEdge(r, coreRoughness)) : -1;
    if (weak >= 0) verdicts[weak].note = 'roughness drops outward across it on part of the circumference: a partial rim/core boundary';
    const from = core >= 0 ? core : weak;
    const start = core >= 0 ? core : weak >= 0 ? weak : firstClear;
    let i = start;
    let steps = 0;
    while (i >= 0) {
      const r = rings[i];
      const strong = i === weak ? false : i === core ? (r.outer.widthPx >= 6 && r.outer.radialShare >= 0.8) || r.outer.inSilhouette < 0.3 : machined(r.outer) || r.outer.inSilhouette < 0.5;
      if (strong) {
        chosen = i;
        confirmed = true;
        break;
      }
      const next = rings.findIndex((q, k) => k > i && counts(q));
      if (next < 0 || steps >= (from >= 0 ? 1 : 2)) {
        if (i !== from) chosen = i;
        break;
      }
      i = next;
      steps++;
    }
    stepped = weak >= 0 ? steps > 1 : steps > 0;
    twin = chosen >= 0 && chosen !== core ? roundTwinInside(rings, chosen, core, weak) : -1;
    if (twin >= 0) {
      bent = chosen;
      chosen = twin;
    }
    if (chosen >= 0) rule = chosen === core ? 'core-is-edge' : core >= 0 ? 'first-edge-outside-core' : weak >= 0 ? 'first-edge-outside-partial-core-edge' : stepped ? 'edge-outside-inner-boundary' : 'innermost-edge';
  }
  let ambiguous = false;
  let innerRoundEdge = false;
  if (chosen >= 0) {
    const ch = rings[chosen];
    verdicts[chosen].role = 'chosen';
    verdicts[chosen].note = noteFor(rule, ch);
    for (let i = 0; i < rings.length; i++) {
      if (i === chosen || verdicts[i].role !== 'candidate') continue;
      if (i === bent) verdicts[i].note = 'the same edge as the rounder ring just inside it, bent outward over part of the circumference (a shadow or a flank against it)';
      else if (i > chosen) verdicts[i].note = outsideNote(rings[i], rings[i - 1]);
      else if (i !== core) innerRoundEdge = innerRoundEdge || rings[i].roundnessPx <= 1.5;
    }
    const further = rings.some((r, i) => i > chosen && i !== bent && counts(r) && r.outer.inSilhouette >= 0.5 && !machined(r.inner));
    // not confirmed (neither a machined flank nor background outside it) and no core edge to count
    // from, or another candidate further out: a person should look
    ambiguous = (!confirmed && (further || core < 0)) || (core < 0 && stepped);
  }
  return { chosen: chosen >= 0 ? rings[chosen] : null, rule, rings: verdicts, center, innerRoundEdge, ambiguous, sectionNotFound, bent: bent >= 0 ? rings[bent] : null };
}

/**
 * The edge itself, found twice: a much rounder ring a few px inside the chosen one, clear on ≥ 50 % of
 * the rays and on ≥ 60 % together with the chosen ring, that the coverage rule alone rejected. A soft
 * cast shadow against one side of the root (external shadow_left: root 505.7 px across, round to
 * 0.63 px, clear on 59 % of the rays; the ring chosen 516.9 px, round to 1.47 px, follows the shadow
 * 6–8 px outside the root over 150° of the circumference) pulls the path outward on that side only,
 * so the chosen ring is less round. Returns its index, or −1.
 */
function roundTwinInside(rings: Ring[], chosen: number, core: number, weak: number): number {
  const i = chosen - 1;
  if (i < 0 || i === core || i === weak) return -1;
  const r = rings[i];
  const ch = rings[chosen];
  const gap = ch.radiusPx - r.radiusPx;
  if (!(gap > 0 && gap <= Math.max(4, 0.03 * ch.radiusPx))) return -1;
  if (!(r.coverage >= 0.5 && r.prominence >= 0.3 && r.roundnessPx <= 1 && r.roundnessPx <= 0.5 * ch.roundnessPx)) return -1;
  let both = 0;
  for (let t = 0; t < r.covered.length; t++) if (r.covered[t] || ch.covered[t]) both++;
  return both >= 0.6 * r.covered.length ? i : -1;
}

function noteFor(rule: string, r: Ring): string {
  const outside = machined(r.outer) ? 'a smooth machined ring (notch flank) lies outside it' : r.outer.inSilhouette < 0.5 ? 'background lies outside it' : 'the surface outside it differs';
  switch (rule) {
    case 'section-diameter':
      return 'nearest to the given section diameter';
    case 'core-is-edge':
      return `the rough core reaches this edge (no band); ${outside}`;
    case 'first-edge-outside-core':
      return `first closed edge outside the rough core, the rim band between; ${outside}`;
    case 'first-edge-outside-partial-core-edge':
      return `first closed edge outside a partial rim/core boundary, the rim band between; ${outside}`;
    default:
      return `innermost closed round edge; ${outside}`;
  }
}

function outsideNote(r: Ring, inner: Ring): string {
  if (r.outer.inSilhouette < 0.5) return 'outer edge of the part (bar edge or silhouette): outside the fracture surface';
  if (machined(inner.outer)) return 'edge beyond a machined ring: outside the fracture surface';
  return 'edge outside the fracture surface (holder, shadow or flank)';
}

/** Pixels inside a polygon (even-odd scanline fill), as a mask of the given size. */
export function polygonMask(poly: readonly PointPx[], width: number, height: number): Mask {
  const data = new Uint8Array(width * height);
  const xs: number[] = [];
  for (let y = 0; y < height; y++) {
    xs.length = 0;
    for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
      const a = poly[i];
      const b = poly[j];
      if ((a.y > y) !== (b.y > y)) xs.push(a.x + ((y - a.y) * (b.x - a.x)) / (b.y - a.y));
    }
    xs.sort((p, q) => p - q);
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const x0 = Math.max(0, Math.ceil(xs[k]));
      const x1 = Math.min(width - 1, Math.floor(xs[k + 1]));
      for (let x = x0; x <= x1; x++) data[y * width + x] = 1;
    }
  }
  return { width, height, data };
}
