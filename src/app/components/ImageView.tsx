/**
 * The image view: a Konva stage with four layers — image, texture overlay, shapes (outline,
 * boundary, sectors, scale line), handles. Wheel zooms about the cursor, dragging the background
 * pans. Handles and tools report edits through `onEdit` (transient during a drag, 'end' at release).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type Konva from 'konva';
import { Circle, Group, Image as KImage, Layer, Line, Stage } from 'react-konva';
import type { PointPx } from '../../core/pipeline/types.js';
import type { Doc, Outline } from '../state/document.js';
import { brushBoundary, insertVertex, moveVertex, nearestVertex, removeVertex, sectorFromDrag } from '../state/geometry.js';
import type { DocPatch, Tool } from '../state/store.js';
import { fitView, overlayShapes, zoomAt } from '../render/layers.js';

export interface ImageViewProps {
  doc: Doc;
  image: HTMLCanvasElement | null;
  overlay: HTMLCanvasElement | null;
  overlayOpacity: number;
  tool: Tool;
  brushRadiusPx: number;
  width: number;
  height: number;
  onEdit(patch: DocPatch, mode: 'commit' | 'transient' | 'end', label: string): void;
  onPointer(p: PointPx | null): void;
  onScaleLine(p0: PointPx, p1: PointPx): void;
  onStage?(stage: Konva.Stage | null): void;
}

/** Konva image view of one document (pure rendering of `doc` + local view transform). */
export function ImageView(props: ImageViewProps) {
  const { doc, tool, width, height } = props;
  const stageRef = useRef<Konva.Stage | null>(null);
  const [view, setView] = useState(() => fitView(doc.widthPx, doc.heightPx, width, height));
  const [draft, setDraft] = useState<{ kind: 'line' | 'sector'; from: PointPx; to: PointPx } | null>(null);
  const [cursor, setCursor] = useState<PointPx | null>(null);
  const brushing = useRef(false);

  useEffect(() => {
    setView(fitView(doc.widthPx, doc.heightPx, width, height));
  }, [doc.id, doc.widthPx, doc.heightPx, width, height]);
  useEffect(() => {
    props.onStage?.(stageRef.current);
    return () => props.onStage?.(null);
  });

  const shapes = useMemo(() => overlayShapes(doc, tool), [doc, tool]);
  const k = 1 / view.scale; // screen px → image px (constant on-screen sizes)

  const toImage = (): PointPx | null => {
    const st = stageRef.current;
    const p = st?.getPointerPosition();
    if (!st || !p) return null;
    return { x: (p.x - view.x) / view.scale, y: (p.y - view.y) / view.scale };
  };

  const onWheel = (e: Konva.KonvaEventObject<WheelEvent>) => {
    e.evt.preventDefault();
    const p = stageRef.current?.getPointerPosition();
    if (!p) return;
    setView((v) => zoomAt(v, p, e.evt.deltaY < 0 ? 1.15 : 1 / 1.15));
  };

  const center = shapes.center;
  const brushAt = (p: PointPx, mode: 'transient' | 'end') => {
    if (!doc.boundary || !center) return;
    const m = tool === 'brush-add' ? 'add' : 'remove';
    props.onEdit({ boundary: brushBoundary(doc.boundary, center, p, props.brushRadiusPx, m), boundaryEdited: true }, mode, m === 'add' ? 'brush: rim' : 'brush: core');
  };

  const onMouseDown = (e: Konva.KonvaEventObject<MouseEvent>) => {
    if (e.evt.button !== 0) return;
    const p = toImage();
    if (!p) return;
    if (tool === 'scale-line') setDraft({ kind: 'line', from: p, to: p });
    else if (tool === 'sector' && center) setDraft({ kind: 'sector', from: p, to: p });
    else if ((tool === 'brush-add' || tool === 'brush-remove') && doc.boundary) {
      brushing.current = true;
      brushAt(p, 'transient');
    } else if (tool === 'add-vertex' && doc.boundary) {
      props.onEdit({ boundary: insertVertex(doc.boundary, p).poly, boundaryEdited: true }, 'commit', 'add point');
    } else if (tool === 'remove-vertex' && doc.boundary) {
      const i = nearestVertex(doc.boundary, p, 12 * k);
      if (i >= 0) props.onEdit({ boundary: removeVertex(doc.boundary, i), boundaryEdited: true }, 'commit', 'remove point');
    }
  };
  const onMouseMove = () => {
    const p = toImage();
    setCursor(p);
    props.onPointer(p);
    if (!p) return;
    if (draft) setDraft({ ...draft, to: p });
    if (brushing.current) brushAt(p, 'transient');
  };
  const onMouseUp = () => {
    const p = toImage();
    if (brushing.current) {
      brushing.current = false;
      if (p) brushAt(p, 'end');
    }
    if (draft && p) {
      if (draft.kind === 'line' && Math.hypot(p.x - draft.from.x, p.y - draft.from.y) > 2) props.onScaleLine(draft.from, p);
      if (draft.kind === 'sector' && center) {
        const s = sectorFromDrag(center, draft.from, p);
        if (Math.abs(s[1] - s[0]) > 0.5) props.onEdit({ exclude: [...doc.exclude, s] }, 'commit', 'exclude sector');
      }
    }
    setDraft(null);
  };

  const panning = tool === 'pan' || tool === 'vertex' || tool === 'outline' || tool === 'add-vertex' || tool === 'remove-vertex';

  const dragVertex = (i: number, e: Konva.KonvaEventObject<DragEvent>, mode: 'transient' | 'end') => {
    if (!doc.boundary) return;
    const n = e.target;
    props.onEdit({ boundary: moveVertex(doc.boundary, i, { x: n.x(), y: n.y() }), boundaryEdited: true }, mode, 'move point');
  };

  const dragOutline = (which: 'center' | 'a' | 'b', e: Konva.KonvaEventObject<DragEvent>, mode: 'transient' | 'end') => {
    const o = doc.outline;
    if (!o) return;
    const x = e.target.x();
    const y = e.target.y();
    let next: Outline;
    if (which === 'center') next = { ...o, cx: x, cy: y };
    else if (which === 'a') {
      const r = Math.hypot(x - o.cx, y - o.cy);
      const ang = (Math.atan2(-(y - o.cy), x - o.cx) * 180) / Math.PI;
      next = { ...o, rx: Math.max(2, r), angleDeg: ang };
    } else next = { ...o, ry: Math.max(2, Math.hypot(x - o.cx, y - o.cy)) };
    props.onEdit({ outline: next, outlineEdited: true }, mode, 'adjust outline');
  };

  const handleR = 3 * k;
  const sectorLive = draft?.kind === 'sector' && center ? sectorFromDrag(center, draft.from, draft.to) : null;

  return (
    <div className="stage-wrap" data-testid="stage-wrap" data-view={JSON.stringify(view)}>
    <button className="zoom-fit" data-testid="zoom-fit" title="Fit the image to the view" onClick={() => setView(fitView(doc.widthPx, doc.heightPx, width, height))}>
      Fit
    </button>
    <Stage
      ref={(s) => {
        stageRef.current = s;
      }}
      width={width}
      height={height}
      x={view.x}
      y={view.y}
      scaleX={view.scale}
      scaleY={view.scale}
      draggable={panning}
      onDragEnd={(e) => {
        if (e.target === stageRef.current) setView((v) => ({ ...v, x: e.target.x(), y: e.target.y() }));
      }}
      onWheel={onWheel}
      onMouseDown={onMouseDown}
      onMouseMove={onMouseMove}
      onMouseUp={onMouseUp}
      onMouseLeave={() => {
        setCursor(null);
        props.onPointer(null);
      }}
      data-testid="stage"
    >
      <Layer listening={false} imageSmoothingEnabled={false}>
        {props.image && <KImage image={props.image} x={-0.5} y={-0.5} width={doc.widthPx} height={doc.heightPx} />}
      </Layer>
      <Layer listening={false} imageSmoothingEnabled={false}>
        {props.overlay && (
          <KImage image={props.overlay} x={-0.5} y={-0.5} width={doc.widthPx} height={doc.heightPx} opacity={props.overlayOpacity} />
        )}
      </Layer>
      <Layer listening={false}>
        {shapes.sectors.map((s) => (
          <Line key={`sec${s.index}`} points={s.points} closed fill="rgba(120,120,120,0.35)" stroke="#666" strokeWidth={1 * k} />
        ))}
        {shapes.outline && <Line points={shapes.outline} closed stroke="#2aa6ff" strokeWidth={1.5 * k} />}
        {shapes.boundary && <Line points={shapes.boundary} closed stroke="#ffb020" strokeWidth={1.5 * k} />}
        {center && <Line points={[center.x - 6 * k, center.y, center.x + 6 * k, center.y, center.x, center.y, center.x, center.y - 6 * k, center.x, center.y + 6 * k]} stroke="#2aa6ff" strokeWidth={1 * k} />}
        {shapes.bar && <Line points={[shapes.bar[0].x, shapes.bar[0].y, shapes.bar[1].x, shapes.bar[1].y]} stroke="#ff3d7f" strokeWidth={2 * k} />}
        {shapes.scaleLine && (
          <Line points={[shapes.scaleLine[0].x, shapes.scaleLine[0].y, shapes.scaleLine[1].x, shapes.scaleLine[1].y]} stroke="#ff3d7f" strokeWidth={2 * k} dash={[6 * k, 3 * k]} />
        )}
        {draft?.kind === 'line' && <Line points={[draft.from.x, draft.from.y, draft.to.x, draft.to.y]} stroke="#ff3d7f" strokeWidth={2 * k} />}
        {sectorLive && center && (
          <Line points={[draft!.from.x, draft!.from.y, center.x, center.y, draft!.to.x, draft!.to.y]} stroke="#444" strokeWidth={1.5 * k} dash={[4 * k, 4 * k]} />
        )}
        {cursor && (tool === 'brush-add' || tool === 'brush-remove') && (
          <Circle x={cursor.x} y={cursor.y} radius={props.brushRadiusPx} stroke={tool === 'brush-add' ? '#ffb020' : '#7a4dff'} strokeWidth={1 * k} />
        )}
      </Layer>
      <Layer>
        {shapes.handles.map((p, i) => (
          <Circle
            key={`h${i}`}
            name="boundary-handle"
            x={p.x}
            y={p.y}
            radius={handleR}
            fill="#ffb020"
            stroke="#3a2a00"
            strokeWidth={0.8 * k}
            draggable={tool === 'vertex'}
            onDragMove={(e) => dragVertex(i, e, 'transient')}
            onDragEnd={(e) => {
              e.cancelBubble = true;
              dragVertex(i, e, 'end');
            }}
          />
        ))}
        {shapes.outlineHandles && (
          <Group>
            {(['center', 'a', 'b'] as const).map((w) => (
              <Circle
                key={w}
                name={`outline-${w}`}
                x={shapes.outlineHandles![w].x}
                y={shapes.outlineHandles![w].y}
                radius={6 * k}
                fill="#2aa6ff"
                stroke="#003a5c"
                strokeWidth={1 * k}
                draggable
                onDragMove={(e) => dragOutline(w, e, 'transient')}
                onDragEnd={(e) => {
                  e.cancelBubble = true;
                  dragOutline(w, e, 'end');
                }}
              />
            ))}
          </Group>
        )}
      </Layer>
    </Stage>
    </div>
  );
}
