/** The Konva layers of the image view, drawn from `shapesOf` (pure) and the drag in progress. */
import { Circle, Group, Image as KImage, Layer, Line, Text } from 'react-konva';
import type { PointPx } from '../../../core/index.js';
import { sectorFromDrag } from '../../state/geometry.js';
import { wedge, type Shapes } from '../../render/layers.js';
import type { Drag } from './drag.js';
import type { Doc, LabelClass } from '../../state/document.js';
import { LABEL_COLOURS } from '../../state/labels.js';
import type { Tool } from '../../state/store.js';

const OUTER = '#2aa6ff';
const BOUNDARY = '#ffb020';
const SCALE = '#ff3d7f';

export function ImageLayers(p: { image: HTMLCanvasElement | null; texture: HTMLCanvasElement | null; opacity: number; w: number; h: number }) {
  return (
    <>
      <Layer listening={false} imageSmoothingEnabled={false}>
        {p.image && <KImage image={p.image} x={-0.5} y={-0.5} width={p.w} height={p.h} />}
      </Layer>
      <Layer listening={false} imageSmoothingEnabled={false}>
        {p.texture && <KImage image={p.texture} x={-0.5} y={-0.5} width={p.w} height={p.h} opacity={p.opacity} />}
      </Layer>
    </>
  );
}

function line(a: PointPx, b: PointPx): number[] {
  return [a.x, a.y, b.x, b.y];
}

/** Outline, boundary, sectors (clipped to the outline), centre, scale bar and line, drafts. */
export function ShapeLayer({ s, k, drag, brush }: { s: Shapes; k: number; drag: Drag | null; brush: { at: PointPx; r: number; rim: boolean } | null }) {
  const outline = s.outline;
  const c = s.centre;
  const live = drag?.kind === 'sector' && c ? sectorFromDrag(c, drag.from, drag.to) : null;
  return (
    <Layer listening={false}>
      {outline && s.sectors.length > 0 && (
        <Group
          clipFunc={(ctx) => {
            ctx.beginPath();
            ctx.moveTo(outline[0], outline[1]);
            for (let i = 2; i < outline.length; i += 2) ctx.lineTo(outline[i], outline[i + 1]);
            ctx.closePath();
          }}
        >
          {s.sectors.map((w, i) => (
            <Line key={i} points={w} closed fill="rgba(20,20,20,0.45)" stroke="#bbb" strokeWidth={k} />
          ))}
        </Group>
      )}
      {s.others.map((o) => (
        <Group key={o.id}>
          <Line points={o.outline} closed stroke={OUTER} strokeWidth={1.5 * k} dash={[6 * k, 4 * k]} />
          {o.boundary && <Line points={o.boundary} closed stroke={BOUNDARY} strokeWidth={1.5 * k} dash={[6 * k, 4 * k]} />}
        </Group>
      ))}
      {s.edges.map((e) => (
        <Group key={`edge-${e.index}`}>
          {/* rejected edges faint and unlabelled (the scale panel lists them with the reason) */}
          <Line points={e.points} closed stroke={e.role === 'chosen' ? OUTER : e.role === 'rejected' ? 'rgba(190,198,210,0.45)' : '#f2f2f2'} strokeWidth={k} dash={[6 * k, 4 * k]} />
          {(e.role !== 'rejected' || e.inUse) && (
            <Text x={e.at.x + 4 * k} y={e.at.y - 14 * k} text={e.label + (e.inUse ? ' ✓' : '')} fontSize={12 * k} fontStyle={e.inUse ? 'bold' : 'normal'} fill={e.role === 'chosen' ? '#9fd8ff' : '#f2f2f2'} shadowColor="#000" shadowBlur={2 * k} shadowOpacity={0.9} />
          )}
        </Group>
      ))}
      {outline && <Line points={outline} closed stroke={OUTER} strokeWidth={1.5 * k} />}
      {s.boundary && <Line points={s.boundary} closed stroke={BOUNDARY} strokeWidth={1.5 * k} />}
      {c && <Line points={[c.x - 6 * k, c.y, c.x + 6 * k, c.y, c.x, c.y, c.x, c.y - 6 * k, c.x, c.y + 6 * k]} stroke={OUTER} strokeWidth={k} />}
      {s.bar && <Line points={line(s.bar[0], s.bar[1])} stroke={SCALE} strokeWidth={2 * k} />}
      {s.scaleLine && <Line points={line(s.scaleLine[0], s.scaleLine[1])} stroke={SCALE} strokeWidth={2 * k} dash={[6 * k, 3 * k]} />}
      {drag?.kind === 'line' && <Line points={line(drag.from, drag.to)} stroke={SCALE} strokeWidth={2 * k} />}
      {live && c && drag?.kind === 'sector' && (
        <>
          <Line points={wedge(c, live[0], live[1], Math.hypot(drag.from.x - c.x, drag.from.y - c.y))} closed fill="rgba(20,20,20,0.3)" />
          <Line points={[drag.from.x, drag.from.y, c.x, c.y, drag.to.x, drag.to.y]} stroke="#eee" strokeWidth={1.5 * k} dash={[4 * k, 4 * k]} />
        </>
      )}
      {brush && <Circle x={brush.at.x} y={brush.at.y} radius={brush.r} stroke={brush.rim ? BOUNDARY : '#b48cff'} strokeWidth={k} />}
    </Layer>
  );
}

/** Handles: the boundary point under the pointer, or the outline's centre and reshape handles. */
export function HandleLayer({ s, k }: { s: Shapes; k: number }) {
  const h = s.outlineHandles;
  return (
    <Layer listening={false}>
      {s.hoverVertex && <Circle x={s.hoverVertex.x} y={s.hoverVertex.y} radius={5 * k} fill={BOUNDARY} stroke="#3a2a00" strokeWidth={k} />}
      {h && (
        <>
          <Circle x={h.centre.x} y={h.centre.y} radius={7 * k} fill={OUTER} stroke="#003a5c" strokeWidth={k} />
          {h.points.map((q, i) => (
            <Circle key={i} x={q.x} y={q.y} radius={5 * k} fill="#fff" stroke={OUTER} strokeWidth={1.5 * k} />
          ))}
        </>
      )}
    </Layer>
  );
}

const css = (c: [number, number, number], a = 1): string => `rgba(${c[0]},${c[1]},${c[2]},${a})`;
const TOOL_CLASS: Partial<Record<Tool, LabelClass>> = { 'teach-outside': 1, 'teach-rim': 2, 'teach-core': 3 };

/** Teach mode: the class map (stretched from the working copy to the image) and the strokes painted. */
export function LabelLayer(p: { doc: Doc; classMap: HTMLCanvasElement | null; opacity: number; pointer: PointPx | null; tool: Tool; r: number; k: number }) {
  const w = p.doc.image.widthPx;
  const h = p.doc.image.heightPx;
  const cls = TOOL_CLASS[p.tool];
  return (
    <Layer listening={false}>
      {p.classMap && <KImage image={p.classMap} x={-0.5} y={-0.5} width={w} height={h} opacity={p.opacity} />}
      {p.doc.labels.map((s, i) => {
        // a dark rim under each stroke keeps it visible over the class map of its own colour
        const pts = s.points.length === 1 ? [s.points[0].x, s.points[0].y, s.points[0].x + 0.01, s.points[0].y] : s.points.flatMap((q) => [q.x, q.y]);
        return (
          <Group key={i}>
            <Line points={pts} stroke="rgba(10,14,22,0.8)" strokeWidth={2 * s.radiusPx + 3 * p.k} lineCap="round" lineJoin="round" />
            <Line points={pts} stroke={css(LABEL_COLOURS[s.cls])} strokeWidth={2 * s.radiusPx} lineCap="round" lineJoin="round" />
          </Group>
        );
      })}
      {p.pointer && cls && <Circle x={p.pointer.x} y={p.pointer.y} radius={p.r} stroke={css(LABEL_COLOURS[cls])} strokeWidth={p.k} />}
    </Layer>
  );
}
