// Where the chart's own labels go ("1", "2", "now", "target"): of eight spots around a mark, the one farthest
// from the other marks and lines, kept inside the plot. A drawing choice, checked by eye in the screenshots.
import type { Frame, Point } from './chartGeometry.ts';

export interface Obstacles {
  points: Point[];
  segments: [Point, Point][];
}

export interface Spot {
  x: number;
  y: number;
  anchor: 'start' | 'middle' | 'end';
}

/** Width of a label in drawing units: about 0.62 em a character at the chart's type sizes. */
const widthOf = (words: string, size: number) => words.length * size * 0.62;

function toSegment(p: Point, [a, b]: [Point, Point]): number {
  const dx = b.x - a.x,
    dy = b.y - a.y,
    l2 = dx * dx + dy * dy;
  const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / l2));
  return Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy));
}

// upper right first: the spot taken when nothing is in the way
const ANGLES = [-45, 0, -90, -135, 180, 45, 90, 135];

export function labelSpot(
  at: Point,
  words: string,
  size: number,
  distance: number,
  f: Frame,
  avoid: Obstacles,
): Spot {
  const w = widthOf(words, size);
  let best: { spot: Spot; score: number } | null = null;
  for (const angle of ANGLES) {
    const ux = Math.cos((angle * Math.PI) / 180),
      uy = Math.sin((angle * Math.PI) / 180);
    const anchor = ux > 0.3 ? 'start' : ux < -0.3 ? 'end' : 'middle';
    // the middle of the label: beside the mark across, above or below it clear of the type's height
    const cx = at.x + ux * distance + (anchor === 'start' ? w / 2 : anchor === 'end' ? -w / 2 : 0);
    const cy = at.y + uy * (distance + size * 0.35);
    const probes = [-w / 2, 0, w / 2].flatMap((dx) =>
      [-size / 3, size / 3].map((dy) => ({ x: cx + dx, y: cy + dy })),
    );
    let score = Math.min(
      ...probes.flatMap((p) => [
        ...avoid.points.map((q) => Math.hypot(p.x - q.x, p.y - q.y)),
        ...avoid.segments.map((s) => toSegment(p, s)),
      ]),
      40,
    );
    const inside =
      cx - w / 2 >= f.left + 2 &&
      cx + w / 2 <= f.left + f.width - 2 &&
      cy - size / 2 >= f.top + 2 &&
      cy + size / 2 <= f.top + f.height - 2;
    if (!inside) score -= 100;
    if (!best || score > best.score + 0.5) {
      const x = anchor === 'start' ? cx - w / 2 : anchor === 'end' ? cx + w / 2 : cx;
      best = { spot: { x, y: cy + size * 0.35, anchor }, score };
    }
  }
  return (best as { spot: Spot }).spot;
}
