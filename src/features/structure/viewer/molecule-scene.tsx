import { useEffect, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { Canvas, useThree } from '@react-three/fiber';
import * as THREE from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import { elementColour, VIEWER_BACKGROUND } from './element-colours';
import {
  AXIS_COLOUR,
  axisLabel,
  axisPattern,
  axisThickness,
  dashSegments,
  INVERSION_COLOUR,
  PLANE_COLOURS,
  PLANE_OPACITY,
  PRINCIPAL_AXIS_COLOUR,
} from './element-style';
import { drawRadius, type Vec3 } from './geometry';
import type { SceneModel } from './scene-model';

/** Which layers are drawn; every one has a labelled checkbox in the viewer panel. */
export interface Layers {
  axes: boolean;
  planes: boolean;
  inversion: boolean;
  overlay: boolean;
  arrows: boolean;
}

const BOND_COLOUR = '#8d96aa';
const GHOST_COLOUR = '#d9dfeb';
const ARROW_COLOUR = '#ff8f7a';
const UP = new THREE.Vector3(0, 1, 0);
const Z = new THREE.Vector3(0, 0, 1);
const STEP = Math.PI / 18; // 10° per arrow key

/** Position, orientation and length of a cylinder (unit height along y) spanning a → b. */
function span(a: Vec3, b: Vec3) {
  const va = new THREE.Vector3(...a);
  const vb = new THREE.Vector3(...b);
  const dir = vb.clone().sub(va);
  const length = dir.length();
  const quaternion = new THREE.Quaternion().setFromUnitVectors(UP, dir.clone().normalize());
  const position = va.clone().add(vb).multiplyScalar(0.5);
  return { position, quaternion, length };
}

function Cylinder({ a, b, radius, colour, opacity = 1 }: { a: Vec3; b: Vec3; radius: number; colour: string; opacity?: number }) {
  const { position, quaternion, length } = useMemo(() => span(a, b), [a, b]);
  if (length < 1e-9) return null;
  return (
    <mesh position={position} quaternion={quaternion} scale={[radius, length, radius]}>
      <cylinderGeometry args={[1, 1, 1, 12, 1]} />
      <meshStandardMaterial color={colour} roughness={0.6} transparent={opacity < 1} opacity={opacity} />
    </mesh>
  );
}

/** A text label that always faces the camera (canvas texture on a sprite). */
function Label({ text, position, colour }: { text: string; position: Vec3; colour: string }) {
  const texture = useMemo(() => {
    const canvas = document.createElement('canvas');
    canvas.width = 256;
    canvas.height = 64;
    const ctx = canvas.getContext('2d');
    if (ctx) {
      ctx.font = '600 34px "JetBrains Mono", monospace';
      ctx.textAlign = 'center';
      ctx.textBaseline = 'middle';
      ctx.lineWidth = 6;
      ctx.strokeStyle = VIEWER_BACKGROUND;
      ctx.strokeText(text, 128, 32);
      ctx.fillStyle = colour;
      ctx.fillText(text, 128, 32);
    }
    const t = new THREE.CanvasTexture(canvas);
    t.colorSpace = THREE.SRGBColorSpace;
    return t;
  }, [text, colour]);
  useEffect(() => () => texture.dispose(), [texture]);
  return (
    <sprite position={position} scale={[1.6, 0.4, 1]} renderOrder={10}>
      <spriteMaterial map={texture} depthTest={false} transparent />
    </sprite>
  );
}

function Atoms({ model }: { model: SceneModel }) {
  const sphere = useMemo(() => new THREE.SphereGeometry(1, 28, 18), []);
  const materials = useMemo(
    () => new Map(model.symbols.map((s) => [s, new THREE.MeshStandardMaterial({ color: elementColour(s), roughness: 0.45, metalness: 0.05 })])),
    [model.symbols],
  );
  useEffect(() => () => { sphere.dispose(); materials.forEach((m) => m.dispose()); }, [sphere, materials]);
  return (
    <>
      {model.atoms.map((a, i) => (
        <mesh key={i} geometry={sphere} material={materials.get(a.element)} position={[a.x, a.y, a.z]} scale={drawRadius(a.element)} />
      ))}
      {model.bonds.map(([i, j]) => {
        const a = model.atoms[i];
        const b = model.atoms[j];
        return <Cylinder key={`${i}-${j}`} a={[a.x, a.y, a.z]} b={[b.x, b.y, b.z]} radius={0.09} colour={BOND_COLOUR} />;
      })}
    </>
  );
}

function Overlay({ model }: { model: SceneModel }) {
  return (
    <>
      {model.aligned.map((a, i) => (
        <mesh key={i} position={[a.x, a.y, a.z]} scale={drawRadius(a.element) * 1.12}>
          <sphereGeometry args={[1, 14, 10]} />
          <meshBasicMaterial color={GHOST_COLOUR} wireframe transparent opacity={0.45} />
        </mesh>
      ))}
    </>
  );
}

function Arrows({ model }: { model: SceneModel }) {
  const helpers = useMemo(
    () =>
      model.arrows.map((arrow) => {
        const from = new THREE.Vector3(...arrow.from);
        const dir = new THREE.Vector3(...arrow.to).sub(from);
        const length = dir.length();
        const head = Math.min(0.22, length * 0.35);
        return new THREE.ArrowHelper(dir.normalize(), from, length, ARROW_COLOUR, head, head * 0.6);
      }),
    [model.arrows],
  );
  useEffect(() => () => helpers.forEach((h) => h.dispose()), [helpers]);
  return (
    <>
      {helpers.map((h, i) => (
        <primitive key={i} object={h} />
      ))}
    </>
  );
}

function Axes({ model }: { model: SceneModel }) {
  const half = model.radius + 0.9;
  const c = model.centre;
  return (
    <>
      {model.elements.axes.map((axis, k) => {
        const d = axis.direction;
        const at = (t: number): Vec3 => [c[0] + d[0] * t, c[1] + d[1] * t, c[2] + d[2] * t];
        const colour = axis.principal ? PRINCIPAL_AXIS_COLOUR : AXIS_COLOUR;
        const r = axisThickness(axis.order, axis.principal);
        return (
          <group key={k}>
            {dashSegments(half, axisPattern(axis.order)).map(([s, e], n) => (
              <Cylinder key={n} a={at(s)} b={at(e)} radius={r} colour={colour} />
            ))}
            <Label text={axisLabel(axis.order, axis.improperOrder)} position={at(half + 0.35)} colour={colour} />
          </group>
        );
      })}
    </>
  );
}

function Planes({ model }: { model: SceneModel }) {
  const radius = model.radius + 0.6;
  // Many planes (Oh has nine) would turn the molecule milky: share one overall haze between them.
  const opacity = Math.min(PLANE_OPACITY, Math.max(0.06, 0.6 / model.elements.planes.length));
  return (
    <>
      {model.elements.planes.map((plane, k) => {
        const q = new THREE.Quaternion().setFromUnitVectors(Z, new THREE.Vector3(...plane.normal).normalize());
        const colour = PLANE_COLOURS[plane.kind];
        return (
          <group key={k} position={model.centre} quaternion={q}>
            <mesh renderOrder={1}>
              <circleGeometry args={[radius, 64]} />
              <meshBasicMaterial color={colour} transparent opacity={opacity} side={THREE.DoubleSide} depthWrite={false} />
            </mesh>
            <mesh renderOrder={2}>
              <ringGeometry args={[radius - 0.03, radius, 64]} />
              <meshBasicMaterial color={colour} transparent opacity={0.7} side={THREE.DoubleSide} depthWrite={false} />
            </mesh>
          </group>
        );
      })}
    </>
  );
}

function Controls({ distance }: { distance: number }) {
  const { camera, gl, invalidate } = useThree();
  useEffect(() => {
    const controls = new OrbitControls(camera, gl.domElement);
    controls.enableDamping = false;
    controls.minDistance = distance * 0.25;
    controls.maxDistance = distance * 4;
    controls.addEventListener('change', () => invalidate());
    return () => controls.dispose();
  }, [camera, gl, invalidate, distance]);
  return null;
}

/**
 * The 3D view (three.js through @react-three/fiber): atoms, bonds, symmetry elements, the
 * aligned input as wireframe ghosts and the scaled displacement arrows. Rendered on demand
 * (no animation loop). Drag to rotate, wheel to zoom; with focus, arrow keys rotate, + and −
 * zoom, 0 resets.
 */
export function MoleculeScene({ model, layers, label }: { model: SceneModel; layers: Layers; label: string }) {
  const distance = model.radius * 3.2 + 4;
  const [rotation, setRotation] = useState<[number, number]>([0, 0]);
  const [zoom, setZoom] = useState(1);
  const wrapper = useRef<HTMLDivElement>(null);
  const centreOffset: Vec3 = [-model.centre[0], -model.centre[1], -model.centre[2]];

  function onKeyDown(e: KeyboardEvent) {
    const keys: Record<string, () => void> = {
      ArrowLeft: () => setRotation(([x, y]) => [x, y - STEP]),
      ArrowRight: () => setRotation(([x, y]) => [x, y + STEP]),
      ArrowUp: () => setRotation(([x, y]) => [x - STEP, y]),
      ArrowDown: () => setRotation(([x, y]) => [x + STEP, y]),
      '+': () => setZoom((z) => Math.min(4, z * 1.15)),
      '=': () => setZoom((z) => Math.min(4, z * 1.15)),
      '-': () => setZoom((z) => Math.max(0.25, z / 1.15)),
      '0': () => {
        setRotation([0, 0]);
        setZoom(1);
      },
    };
    const action = keys[e.key];
    if (action) {
      e.preventDefault();
      action();
    }
  }

  return (
    <div
      ref={wrapper}
      tabIndex={0}
      role="img"
      aria-label={label}
      aria-describedby="viewer-keys"
      onKeyDown={onKeyDown}
      className="h-full w-full rounded-md focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lapis"
    >
      <Canvas
        frameloop="demand"
        dpr={[1, 2]}
        gl={{ antialias: true, preserveDrawingBuffer: true }}
        camera={{ position: [0, 0, distance], fov: 40, near: 0.1, far: distance * 10 }}
        data-testid="structure-canvas"
      >
        <color attach="background" args={[VIEWER_BACKGROUND]} />
        <ambientLight intensity={0.9} />
        <directionalLight position={[4, 6, 10]} intensity={1.8} />
        <directionalLight position={[-6, -3, -4]} intensity={0.5} />
        <Controls distance={distance} />
        <group rotation={[rotation[0], rotation[1], 0]} scale={zoom}>
          <group position={centreOffset}>
            <Atoms model={model} />
            {layers.overlay && <Overlay model={model} />}
            {layers.arrows && <Arrows model={model} />}
            {layers.planes && <Planes model={model} />}
            {layers.axes && <Axes model={model} />}
            {layers.inversion && model.elements.inversionCentre && (
              <mesh position={model.centre} scale={0.16}>
                <octahedronGeometry args={[1, 0]} />
                <meshStandardMaterial color={INVERSION_COLOUR} emissive={INVERSION_COLOUR} emissiveIntensity={0.25} />
              </mesh>
            )}
          </group>
        </group>
      </Canvas>
    </div>
  );
}
