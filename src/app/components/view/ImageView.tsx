/**
 * The image view: a Konva stage (image, texture map, shapes, handles) with pointer tools, wheel
 * zoom about the cursor, panning, and the readout line under it (cursor in px and µm).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { Stage } from 'react-konva';
import type { PointPx } from '../../../core/index.js';
import type { Doc } from '../../state/document.js';
import { isTeachTool, type Tool } from '../../state/store.js';
import type { Change } from '../../state/actions/types.js';
import { fitView, shapesOf, toImage, zoomAt, type View } from '../../render/layers.js';
import { dragEdit, hint, press, sectorEdit, type Drag, type PointerContext } from './drag.js';
import { HandleLayer, ImageLayers, LabelLayer, ShapeLayer } from './Layers.js';

export interface ImageViewProps {
  doc: Doc;
  tool: Tool;
  image: HTMLCanvasElement | null;
  texture: { canvas: HTMLCanvasElement; opacity: number } | null;
  width: number;
  height: number;
  brushRadiusPx: number;
  /** Radius of the teach brushes, image px. */
  labelRadiusPx: number;
  /** Teach mode: the strokes are drawn, and the class map (working resolution) when there is one. */
  teach: { classMap: HTMLCanvasElement | null; opacity: number } | null;
  nRays: number;
  /** Pixel pitches (µm/px) for the readout, or null without a scale. */
  pitch: { x: number; y: number } | null;
  act(c: Change): void;
  onScaleLine(p0: PointPx, p1: PointPx): void;
}

const fmt = (v: number): string => String(Number(v.toPrecision(5)));

function Readout({ doc, pointer, pitch, tool }: { doc: Doc; pointer: PointPx | null; pitch: ImageViewProps['pitch']; tool: Tool }) {
  const where = pointer
    ? `x ${pointer.x.toFixed(1)} px, y ${pointer.y.toFixed(1)} px` + (pitch ? `  —  x ${fmt(pointer.x * pitch.x)} µm, y ${fmt(pointer.y * pitch.y)} µm` : '  (no scale)')
    : `${doc.image.name}: ${doc.image.widthPx}×${doc.image.heightPx} px, ${doc.image.format}, ${doc.image.bitDepth}-bit`;
  return (
    <div className="readout" data-testid="readout">
      <span>{where}</span>
      <span className="hint-line">{hint(tool, doc)}</span>
    </div>
  );
}

export function ImageView(props: ImageViewProps) {
  const { doc, tool, width, height } = props;
  const wrap = useRef<HTMLDivElement | null>(null);
  const [view, setView] = useState<View>(() => fitView(doc.image.widthPx, doc.image.heightPx, width, height));
  const [drag, setDrag] = useState<Drag | null>(null);
  const [pointer, setPointer] = useState<PointPx | null>(null);
  const viewRef = useRef(view);
  viewRef.current = view;

  useEffect(() => setView(fitView(doc.image.widthPx, doc.image.heightPx, width, height)), [doc.id, doc.image.widthPx, doc.image.heightPx, width, height]);

  // wheel zoom about the cursor (a native, non-passive listener, so the page does not scroll)
  useEffect(() => {
    const el = wrap.current;
    if (!el) return;
    const onWheel = (e: WheelEvent) => {
      e.preventDefault();
      const r = el.getBoundingClientRect();
      setView((v) => zoomAt(v, { x: e.clientX - r.left, y: e.clientY - r.top }, e.deltaY < 0 ? 1.15 : 1 / 1.15));
    };
    el.addEventListener('wheel', onWheel, { passive: false });
    return () => el.removeEventListener('wheel', onWheel);
  }, []);

  const k = 1 / view.scale;
  const shapes = useMemo(() => shapesOf(doc, tool, pointer, k), [doc, tool, pointer, k]);

  const ctxAt = (e: React.PointerEvent): PointerContext => {
    const r = e.currentTarget.getBoundingClientRect();
    const screen = { x: e.clientX - r.left, y: e.clientY - r.top };
    return { doc, tool, p: toImage(viewRef.current, screen), screen, view: viewRef.current, brushRadiusPx: props.brushRadiusPx, labelRadiusPx: props.labelRadiusPx, nRays: props.nRays };
  };

  const onDown = (e: React.PointerEvent<HTMLDivElement>) => {
    if (e.button !== 0 || (e.target instanceof HTMLElement && e.target.closest('button'))) return;
    e.currentTarget.setPointerCapture(e.pointerId);
    const r = press(ctxAt(e));
    setDrag(r.drag);
    if (r.change) props.act(r.change);
  };
  const onMove = (e: React.PointerEvent<HTMLDivElement>) => {
    const c = ctxAt(e);
    setPointer(c.p);
    if (!drag) return;
    if (drag.kind === 'pan') setView({ ...drag.view, x: drag.view.x + c.screen.x - drag.from.x, y: drag.view.y + c.screen.y - drag.from.y });
    else if (drag.kind === 'sector' || drag.kind === 'line') setDrag({ ...drag, to: c.p });
    else {
      const ch = dragEdit(drag, c, 'drag');
      if (ch) props.act(ch);
    }
  };
  const onUp = (e: React.PointerEvent<HTMLDivElement>) => {
    if (!drag) return;
    const c = ctxAt(e);
    setDrag(null);
    if (drag.kind === 'line') {
      if (Math.hypot(c.p.x - drag.from.x, c.p.y - drag.from.y) >= 2) props.onScaleLine(drag.from, c.p);
      return;
    }
    const ch = drag.kind === 'sector' ? sectorEdit({ ...drag, to: c.p }, doc) : dragEdit(drag, c, 'drag-end');
    if (ch) props.act(ch);
  };

  const brushing = (tool === 'brush-add' || tool === 'brush-remove') && pointer;
  return (
    <>
      <div
        ref={wrap}
        className={`stage-wrap tool-${tool}`}
        data-testid="stage-wrap"
        data-view={JSON.stringify(view)}
        onPointerDown={onDown}
        onPointerMove={onMove}
        onPointerUp={onUp}
        onPointerLeave={() => !drag && setPointer(null)}
      >
        <button className="zoom-fit" data-testid="zoom-fit" title="Fit the image to the view" onClick={() => setView(fitView(doc.image.widthPx, doc.image.heightPx, width, height))}>
          Fit
        </button>
        <Stage width={width} height={height} x={view.x} y={view.y} scaleX={view.scale} scaleY={view.scale} listening={false}>
          <ImageLayers image={props.image} texture={props.texture?.canvas ?? null} opacity={props.texture?.opacity ?? 0} w={doc.image.widthPx} h={doc.image.heightPx} />
          {props.teach && <LabelLayer doc={doc} classMap={props.teach.classMap} opacity={props.teach.opacity} pointer={isTeachTool(tool) ? pointer : null} tool={tool} r={props.labelRadiusPx} k={k} />}
          <ShapeLayer s={shapes} k={k} drag={drag} brush={brushing ? { at: pointer, r: props.brushRadiusPx, rim: tool === 'brush-add' } : null} />
          <HandleLayer s={shapes} k={k} />
        </Stage>
      </div>
      <Readout doc={doc} pointer={pointer} pitch={props.pitch} tool={tool} />
    </>
  );
}
