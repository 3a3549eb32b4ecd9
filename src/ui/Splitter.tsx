/**
 * A drag handle that resizes a pane: sets a CSS size variable on the app (--left-w, --right-w,
 * --strip-h) in px, within limits that keep every pane usable. Focusable: the arrow keys resize by
 * 16 px (with shift: 64 px), Home and End go to the limits.
 */
import { useState } from 'react';

const KEY_STEP_PX = 16;

export function Splitter({
  cssVar,
  axis,
  sign,
  min,
  max,
  label = 'Drag to resize',
}: {
  cssVar: string;
  axis: 'col' | 'row';
  /** +1: dragging right (down) makes the pane bigger; -1: smaller. */
  sign: 1 | -1;
  min: number;
  max: number;
  label?: string;
}) {
  const [dragging, setDragging] = useState(false);
  const [sizePx, setSizePx] = useState<number | null>(null);
  const paneSize = (pane: HTMLElement) =>
    axis === 'col' ? pane.getBoundingClientRect().width : pane.getBoundingClientRect().height;
  const apply = (app: HTMLElement, size: number) => {
    const s = Math.round(Math.max(min, Math.min(max, size)));
    app.style.setProperty(cssVar, `${s}px`);
    setSizePx(s);
  };
  const onDown = (ev: React.MouseEvent<HTMLDivElement>) => {
    const app = ev.currentTarget.closest('.app') as HTMLElement | null;
    const pane = ev.currentTarget.parentElement;
    if (!app || !pane) return;
    ev.preventDefault();
    const start = axis === 'col' ? ev.clientX : ev.clientY;
    const size0 = paneSize(pane);
    setDragging(true);
    const onMove = (e: MouseEvent) => {
      const pos = axis === 'col' ? e.clientX : e.clientY;
      apply(app, size0 + sign * (pos - start));
    };
    const onUp = () => {
      setDragging(false);
      window.removeEventListener('mousemove', onMove);
      window.removeEventListener('mouseup', onUp);
    };
    window.addEventListener('mousemove', onMove);
    window.addEventListener('mouseup', onUp);
  };
  const onKey = (ev: React.KeyboardEvent<HTMLDivElement>) => {
    const app = ev.currentTarget.closest('.app') as HTMLElement | null;
    const pane = ev.currentTarget.parentElement;
    if (!app || !pane) return;
    const step = ev.shiftKey ? 4 * KEY_STEP_PX : KEY_STEP_PX;
    // Arrow towards the pane's far side grows it (right/down when sign is +1).
    const grow = axis === 'col' ? ['ArrowRight', 'ArrowLeft'] : ['ArrowDown', 'ArrowUp'];
    let size: number | null = null;
    if (ev.key === grow[0]) size = paneSize(pane) + sign * step;
    else if (ev.key === grow[1]) size = paneSize(pane) - sign * step;
    else if (ev.key === 'Home') size = min;
    else if (ev.key === 'End') size = max;
    if (size === null) return;
    ev.preventDefault();
    ev.stopPropagation();
    apply(app, size);
  };
  return (
    // biome-ignore lint/a11y/useSemanticElements: a focusable separator (WAI-ARIA window splitter), no native element
    <div
      className={`splitter ${axis} ${dragging ? 'dragging' : ''}`}
      role="separator"
      tabIndex={0}
      aria-orientation={axis === 'col' ? 'vertical' : 'horizontal'}
      aria-label={label}
      aria-valuemin={min}
      aria-valuemax={max}
      aria-valuenow={sizePx ?? undefined}
      style={axis === 'col' ? (sign === 1 ? { right: -3 } : { left: -3 }) : undefined}
      onMouseDown={onDown}
      onKeyDown={onKey}
    />
  );
}
