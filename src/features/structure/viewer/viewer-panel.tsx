import { Component, lazy, Suspense, useEffect, useId, useMemo, useState, type ReactNode } from 'react';
import type { AtomJson, StructureResult } from '@shared/contracts/structure';
import { focusRing } from '@/components/ui/focus';
import { cx } from '@/lib/cx';
import { formatAngstrom } from '@/lib/format';
import { elementColour, VIEWER_BACKGROUND } from './element-colours';
import { AXIS_COLOUR, axisLabel, axisPatternName, INVERSION_COLOUR, PLANE_COLOURS } from './element-style';
import type { Layers } from './molecule-scene';
import { buildSceneModel, hasWebGL } from './scene-model';

// three.js and the renderer are loaded only when a structure page shows the view.
const MoleculeScene = lazy(() => import('./molecule-scene').then((m) => ({ default: m.MoleculeScene })));

/** Catches a renderer that fails after the WebGL check (context lost, driver refusal). */
class SceneBoundary extends Component<{ fallback: ReactNode; children: ReactNode }, { failed: boolean }> {
  override state = { failed: false };
  static getDerivedStateFromError() {
    return { failed: true };
  }
  override render() {
    return this.state.failed ? this.props.fallback : this.props.children;
  }
}

/** The text shown instead of the 3D view when the browser cannot draw WebGL. */
export function ViewerFallback({ reason }: { reason: string }) {
  return (
    <div role="note" className="flex h-full flex-col items-center justify-center gap-2 rounded-md border border-dashed border-rule bg-paper-deep p-6 text-center">
      <p className="font-medium text-ink">3D view unavailable</p>
      <p className="max-w-md text-sm text-ink-soft">
        {reason} Everything the view would show is listed on this page: the point group, the symmetry operations with their
        axes, the equivalence classes and every atom&apos;s coordinates and displacement.
      </p>
    </div>
  );
}

/**
 * The 3D view with its layer switches and key. Without WebGL it shows a clear text fallback
 * and the rest of the page still works.
 */
export function ViewerPanel({ result, inputAtoms, webgl }: { result: StructureResult; inputAtoms: readonly AtomJson[]; webgl?: boolean }) {
  const model = useMemo(() => buildSceneModel(result, inputAtoms), [result, inputAtoms]);
  const [canDraw, setCanDraw] = useState<boolean | null>(webgl ?? null);
  useEffect(() => {
    if (webgl === undefined) setCanDraw(hasWebGL());
  }, [webgl]);
  const { axes, planes, inversionCentre } = model.elements;
  const [layers, setLayers] = useState<Layers>({ axes: true, planes: true, inversion: true, overlay: false, arrows: false });
  const toggle = (key: keyof Layers) => (on: boolean) => setLayers((l) => ({ ...l, [key]: on }));
  const orders = [...new Set(axes.map((a) => a.order))].sort((a, b) => (a === 0 ? 99 : a) - (b === 0 ? 99 : b));
  const planeKinds = [...new Set(planes.map((p) => p.kind))];
  const label = `3D view of ${result.formula} in ${result.pointGroup}: ${axes.length} rotation axes, ${planes.length} mirror planes${inversionCentre ? ', a centre of inversion' : ''}.`;
  const fallback = <ViewerFallback reason="This browser could not start WebGL, so the molecule cannot be drawn in 3D." />;

  return (
    <section aria-labelledby="viewer-h" className="grid gap-4 rounded-lg border border-rule bg-card p-4 lg:grid-cols-[1fr_17rem]">
      <h2 id="viewer-h" className="sr-only">
        3D view
      </h2>
      <div className="h-[460px] min-w-0 rounded-md" style={{ background: VIEWER_BACKGROUND }}>
        {canDraw === null ? null : canDraw ? (
          <SceneBoundary fallback={fallback}>
            <Suspense
              fallback={
                <div className="flex h-full items-center justify-center">
                  <p role="status" className="text-sm text-paper">
                    Loading the 3D view…
                  </p>
                </div>
              }
            >
              <MoleculeScene model={model} layers={layers} label={label} />
            </Suspense>
          </SceneBoundary>
        ) : (
          fallback
        )}
      </div>
      <div className="flex flex-col gap-4 text-sm">
        <fieldset className="flex flex-col gap-1.5">
          <legend className="mb-1 text-xs font-semibold tracking-wide text-ink-soft uppercase">Show</legend>
          <Switch label={`Rotation axes (${axes.length})`} checked={layers.axes} onChange={toggle('axes')} disabled={axes.length === 0} />
          <Switch label={`Mirror planes (${planes.length})`} checked={layers.planes} onChange={toggle('planes')} disabled={planes.length === 0} />
          <Switch label="Centre of inversion" checked={layers.inversion} onChange={toggle('inversion')} disabled={!inversionCentre} />
          <Switch label="Input geometry (before), as wireframe" checked={layers.overlay} onChange={toggle('overlay')} disabled={model.aligned.length === 0} />
          <Switch label={model.arrows.length ? `Displacement arrows (×${model.arrowScale.toLocaleString('en-GB')})` : 'Displacement arrows'} checked={layers.arrows} onChange={toggle('arrows')} disabled={model.arrows.length === 0} />
        </fieldset>
        {model.arrows.length > 0 ? (
          <p className="text-xs text-ink-soft">
            Arrows run from each input atom to its snapped position, drawn <strong className="num">{model.arrowScale.toLocaleString('en-GB')}×</strong> their
            true length; the longest true displacement is <span className="num">{formatAngstrom(result.maxDisplacement)}</span>.
          </p>
        ) : (
          <p className="text-xs text-ink-soft">
            No atom moved by as much as <span className="num">10⁻⁶ Å</span>: there are no displacement arrows to draw.
          </p>
        )}
        <div className="flex flex-col gap-1.5">
          <h3 className="text-xs font-semibold tracking-wide text-ink-soft uppercase">Key</h3>
          <ul className="flex flex-col gap-1 text-xs text-ink">
            {orders.map((o) => (
              <li key={o} className="flex items-center gap-2">
                <AxisSwatch order={o} />
                <span>
                  <span className="num">{axisLabel(o, null)}</span> axis: {axisPatternName(o)}
                </span>
              </li>
            ))}
            {planeKinds.map((k) => (
              <li key={k} className="flex items-center gap-2">
                <span aria-hidden className="inline-block h-3 w-6 rounded-sm border" style={{ background: PLANE_COLOURS[k] + '55', borderColor: PLANE_COLOURS[k] }} />
                <span>{k} plane</span>
              </li>
            ))}
            {inversionCentre && (
              <li className="flex items-center gap-2">
                <span aria-hidden className="inline-block size-3 rotate-45 border border-ink/40" style={{ background: INVERSION_COLOUR }} />
                <span>centre of inversion</span>
              </li>
            )}
          </ul>
          <ul aria-label="Element colours" className="mt-1 flex flex-wrap gap-1.5">
            {model.symbols.map((s) => (
              <li key={s} className="num flex items-center gap-1 rounded px-1.5 py-0.5 text-xs" style={{ background: VIEWER_BACKGROUND, color: elementColour(s) }}>
                <span aria-hidden className="inline-block size-2.5 rounded-full" style={{ background: elementColour(s) }} />
                {s}
              </li>
            ))}
          </ul>
        </div>
        <p id="viewer-keys" className="text-xs text-ink-faint">
          Drag to turn, scroll to zoom. With the view focused: arrow keys turn, + and − zoom, 0 resets.
        </p>
      </div>
    </section>
  );
}

function AxisSwatch({ order }: { order: number }) {
  const dash = order === 2 || order === 0 ? undefined : order === 3 ? '6 3' : order === 4 ? '3 2' : order === 5 ? '1 2' : '5 2 1 2';
  return (
    <svg aria-hidden width="28" height="8" className="shrink-0 rounded-sm" style={{ background: VIEWER_BACKGROUND }}>
      <line x1="2" y1="4" x2="26" y2="4" stroke={AXIS_COLOUR} strokeWidth={order === 0 ? 3 : 2} strokeDasharray={dash} />
    </svg>
  );
}

function Switch({ label, checked, onChange, disabled }: { label: string; checked: boolean; onChange: (on: boolean) => void; disabled?: boolean }) {
  const id = useId();
  return (
    <div className={cx('flex items-center gap-2', disabled && 'opacity-55')}>
      <input
        id={id}
        type="checkbox"
        role="switch"
        checked={checked && !disabled}
        disabled={disabled}
        onChange={(e) => onChange(e.target.checked)}
        className={cx('size-4 accent-lapis', focusRing)}
      />
      <label htmlFor={id}>{label}</label>
    </div>
  );
}
