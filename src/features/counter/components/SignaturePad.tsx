import { useRef, useState, type PointerEvent } from 'react';

const WIDTH = 600;
const HEIGHT = 180;

/** The seller signs with a finger, stylus or mouse; the strokes are kept as a plain SVG drawing. */
export function SignaturePad({ onChange }: { onChange: (svg: string | null) => void }) {
  const [strokes, setStrokesState] = useState<string[]>([]);
  const latest = useRef<string[]>([]);
  const current = useRef<string | null>(null);
  const setStrokes = (next: string[]) => {
    latest.current = next;
    setStrokesState(next);
  };
  const svgRef = useRef<SVGSVGElement>(null);

  function point(e: PointerEvent<SVGSVGElement>): string {
    const box = svgRef.current!.getBoundingClientRect();
    const x = ((e.clientX - box.left) / box.width) * WIDTH;
    const y = ((e.clientY - box.top) / box.height) * HEIGHT;
    return `${x.toFixed(1)} ${y.toFixed(1)}`;
  }

  function emit(all: string[]) {
    onChange(all.length ? toSvg(all) : null);
  }

  return (
    <div>
      <svg
        ref={svgRef}
        viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
        role="img"
        aria-label="Signature pad: sign here"
        data-testid="signature-pad"
        className="h-44 w-full touch-none rounded-md border-2 border-dashed border-ink-400 bg-white"
        onPointerDown={(e) => {
          e.currentTarget.setPointerCapture(e.pointerId);
          current.current = `M ${point(e)}`;
          setStrokes([...latest.current, current.current]);
        }}
        onPointerMove={(e) => {
          if (!current.current) return;
          current.current += ` L ${point(e)}`;
          setStrokes([...latest.current.slice(0, -1), current.current]);
        }}
        onPointerUp={() => {
          if (!current.current) return;
          current.current = null;
          emit(latest.current);
        }}
      >
        <line x1="20" y1={HEIGHT - 30} x2={WIDTH - 20} y2={HEIGHT - 30} stroke="#cbd3dc" strokeWidth="2" />
        {strokes.map((d, i) => (
          <path key={i} d={d} stroke="#151c26" strokeWidth="3" fill="none" strokeLinecap="round" strokeLinejoin="round" />
        ))}
      </svg>
      <button
        type="button"
        className="btn-quiet mt-2"
        onClick={() => {
          setStrokes([]);
          emit([]);
        }}
      >
        Clear signature
      </button>
    </div>
  );
}

export function toSvg(strokes: string[]): string {
  const paths = strokes.map((d) => `<path d="${d}" stroke="black" stroke-width="3" fill="none"/>`).join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${WIDTH} ${HEIGHT}">${paths}</svg>`;
}
