/** Drawing primitives (pure): shapes → coverage → painted into RGBA images or gray rasters. */
export type { RgbaImage, Ink, Coverage, PointPx } from './types.js';
export { GLYPH_WIDTH, GLYPH_HEIGHT, GLYPH_ADVANCE, glyphBitmap, hasGlyph, measureText } from './font.js';
export { rectCoverage, lineCoverage, polylineCoverage, circleCoverage, discCoverage, ellipseCoverage, textCoverage } from './coverage.js';
export { createRgbaImage, paintRgba, paintGray, paint } from './paint.js';
export { fillRect, drawLine, drawPolyline, drawCircle, fillDisc, drawEllipse, drawText } from './shapes.js';
