// Generators of small closed-form test meshes. Every mesh is a Float32Array of 9 floats per
// triangle, wound counter-clockwise seen from outside (outward normals) unless stated.
export type Point = readonly [number, number, number];
export type Triangle = readonly [Point, Point, Point];

export function toPositions(triangles: readonly Triangle[]): Float32Array {
  const positions = new Float32Array(triangles.length * 9);
  triangles.forEach((triangle, t) => {
    triangle.forEach((point, corner) => positions.set(point, t * 9 + corner * 3));
  });
  return positions;
}

export function flipped(triangle: Triangle): Triangle {
  return [triangle[0], triangle[2], triangle[1]];
}

/** Quad a-b-c-d (counter-clockwise seen from outside) as two triangles. */
function quad(a: Point, b: Point, c: Point, d: Point): Triangle[] {
  return [
    [a, b, c],
    [a, c, d],
  ];
}

/**
 * Axis-aligned box from `min` with the given size. Its four walls are cut into horizontal bands
 * at `wallCutsZ` (absolute z values), so vertices can be placed exactly on a slicing plane.
 * The faces are returned grouped: bottom, top, then walls.
 */
export function boxTriangles(min: Point, size: Point, wallCutsZ: readonly number[] = []): Triangle[] {
  const [x0, y0, z0] = min;
  const x1 = x0 + size[0];
  const y1 = y0 + size[1];
  const z1 = z0 + size[2];
  const levels = [z0, ...wallCutsZ.filter((z) => z > z0 && z < z1).sort((a, b) => a - b), z1];
  const bottom = quad([x0, y0, z0], [x0, y1, z0], [x1, y1, z0], [x1, y0, z0]);
  const top = quad([x0, y0, z1], [x1, y0, z1], [x1, y1, z1], [x0, y1, z1]);
  const walls: Triangle[] = [];
  for (let k = 0; k + 1 < levels.length; k++) {
    const lo = levels[k]!;
    const hi = levels[k + 1]!;
    walls.push(
      ...quad([x0, y0, lo], [x1, y0, lo], [x1, y0, hi], [x0, y0, hi]), // y = y0, facing −y
      ...quad([x1, y0, lo], [x1, y1, lo], [x1, y1, hi], [x1, y0, hi]), // x = x1, facing +x
      ...quad([x1, y1, lo], [x0, y1, lo], [x0, y1, hi], [x1, y1, hi]), // y = y1, facing +y
      ...quad([x0, y1, lo], [x0, y0, lo], [x0, y0, hi], [x0, y1, hi]), // x = x0, facing −x
    );
  }
  return [...bottom, ...top, ...walls];
}

/** Cube of side a with one corner at `min`: 12 triangles. */
export function cube(side: number, min: Point = [0, 0, 0]): Float32Array {
  return toPositions(boxTriangles(min, [side, side, side]));
}

/** Cube whose top face (two triangles) is wound the wrong way. */
export function cubeWithFlippedTop(side: number): Float32Array {
  const triangles = boxTriangles([0, 0, 0], [side, side, side]);
  return toPositions(triangles.map((triangle, i) => (i === 2 || i === 3 ? flipped(triangle) : triangle)));
}

/** Cube without its top face: an open box. */
export function cubeWithoutTop(side: number): Float32Array {
  return toPositions(boxTriangles([0, 0, 0], [side, side, side]).filter((_, i) => i !== 2 && i !== 3));
}

/** Every face reversed: normals point inwards. */
export function insideOutCube(side: number): Float32Array {
  return toPositions(boxTriangles([0, 0, 0], [side, side, side]).map(flipped));
}

/** Corner tetrahedron (0,0,0), (a,0,0), (0,a,0), (0,0,a). */
export function cornerTetrahedron(a: number): Float32Array {
  const o: Point = [0, 0, 0];
  const x: Point = [a, 0, 0];
  const y: Point = [0, a, 0];
  const z: Point = [0, 0, a];
  return toPositions([
    [o, y, x], // z = 0 face, facing −z
    [o, x, z], // y = 0 face, facing −y
    [o, z, y], // x = 0 face, facing −x
    [x, y, z], // slanted face, facing (1,1,1)
  ]);
}

/** Right prism over a regular N-gon of circumradius r centred on the z axis, from z = 0 to h. */
export function regularPrism(sides: number, radius: number, height: number): Float32Array {
  const ring = (z: number): Point[] =>
    Array.from({ length: sides }, (_, k): Point => {
      const angle = (2 * Math.PI * k) / sides;
      return [radius * Math.cos(angle), radius * Math.sin(angle), z];
    });
  const bottom = ring(0);
  const top = ring(height);
  const bottomCentre: Point = [0, 0, 0];
  const topCentre: Point = [0, 0, height];
  const triangles: Triangle[] = [];
  for (let k = 0; k < sides; k++) {
    const next = (k + 1) % sides;
    triangles.push([bottomCentre, bottom[next]!, bottom[k]!]);
    triangles.push([topCentre, top[k]!, top[next]!]);
    triangles.push(...quad(bottom[k]!, bottom[next]!, top[next]!, top[k]!));
  }
  return toPositions(triangles);
}

/**
 * Square tube: outer side `outer`, square hole of side `inner`, both centred, from z = 0 to h.
 * Cross-section area outer² − inner², contour length 4·outer + 4·inner.
 */
export function squareTube(outer: number, inner: number, height: number): Float32Array {
  const o = outer / 2;
  const i = inner / 2;
  const corners = (half: number, z: number): Point[] => [
    [-half, -half, z],
    [half, -half, z],
    [half, half, z],
    [-half, half, z],
  ];
  const outerBottom = corners(o, 0);
  const outerTop = corners(o, height);
  const innerBottom = corners(i, 0);
  const innerTop = corners(i, height);
  const triangles: Triangle[] = [];
  for (let k = 0; k < 4; k++) {
    const n = (k + 1) % 4;
    triangles.push(...quad(outerBottom[k]!, outerBottom[n]!, outerTop[n]!, outerTop[k]!)); // outer wall, outwards
    triangles.push(...quad(innerBottom[n]!, innerBottom[k]!, innerTop[k]!, innerTop[n]!)); // hole wall, into the hole
    triangles.push(...quad(outerTop[k]!, outerTop[n]!, innerTop[n]!, innerTop[k]!)); // top ring, facing +z
    triangles.push(...quad(outerBottom[n]!, outerBottom[k]!, innerBottom[k]!, innerBottom[n]!)); // bottom ring, −z
  }
  return toPositions(triangles);
}

/**
 * Stairs: the profile of `steps` steps (each `run` deep in x and `rise` high in z, the lowest
 * step the longest) extruded `width` along y. At height z in step k (0-based from the bottom)
 * the cross-section is (steps − k)·run by width.
 */
export function stairs(steps: number, run: number, rise: number, width: number): Float32Array {
  // Profile as (x, z) points, counter-clockwise seen from −y (x to the right, z up).
  const profile: [number, number][] = [[0, 0]];
  for (let k = 0; k < steps; k++) {
    profile.push([(steps - k) * run, k * rise]);
    profile.push([(steps - k) * run, (k + 1) * rise]);
  }
  profile.push([0, steps * rise]);
  const front = (p: [number, number]): Point => [p[0], 0, p[1]];
  const back = (p: [number, number]): Point => [p[0], width, p[1]];
  const triangles: Triangle[] = [];
  // The staircase is star-shaped from (0, 0), so a fan from there triangulates the end caps.
  for (let k = 1; k + 1 < profile.length; k++) {
    triangles.push([front(profile[0]!), front(profile[k]!), front(profile[k + 1]!)]); // y = 0 cap, facing −y
    triangles.push([back(profile[0]!), back(profile[k + 1]!), back(profile[k]!)]); // y = width cap, facing +y
  }
  for (let k = 0; k < profile.length; k++) {
    const a = profile[k]!;
    const b = profile[(k + 1) % profile.length]!;
    triangles.push(...quad(front(a), back(a), back(b), front(b)));
  }
  return toPositions(triangles);
}

export function concat(...meshes: Float32Array[]): Float32Array {
  const out = new Float32Array(meshes.reduce((sum, mesh) => sum + mesh.length, 0));
  let offset = 0;
  for (const mesh of meshes) {
    out.set(mesh, offset);
    offset += mesh.length;
  }
  return out;
}

export function translate(positions: Float32Array, offset: Point): Float32Array {
  const out = new Float32Array(positions.length);
  for (let i = 0; i < positions.length; i += 3) {
    out[i] = positions[i]! + offset[0];
    out[i + 1] = positions[i + 1]! + offset[1];
    out[i + 2] = positions[i + 2]! + offset[2];
  }
  return out;
}
