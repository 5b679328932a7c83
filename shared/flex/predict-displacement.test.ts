import { describe, it, expect } from 'vitest';
import { predictDisplacement, scaleMotion } from './predict-displacement';

describe('predictDisplacement', () => {
  it('applies d = t + omega × r at r = (0, y, z)', () => {
    // hand-checked cross products: omega × r = (wy·z − wz·y, −wx·z, wx·y)
    const motion = { t: { x: 1, y: 2, z: 3 }, omega: { x: 0.01, y: 0.002, z: -0.003 } };
    const d = predictDisplacement(motion, 500, 1000);
    expect(d.dx).toBeCloseTo(1 + 0.002 * 1000 + 0.003 * 500, 12);
    expect(d.dy).toBeCloseTo(2 - 0.01 * 1000, 12);
    expect(d.dz).toBeCloseTo(3 + 0.01 * 500, 12);
  });

  it('scales linearly', () => {
    const motion = { t: { x: 1, y: 2, z: 3 }, omega: { x: 0.01, y: 0.002, z: -0.003 } };
    const d = predictDisplacement(scaleMotion(motion, 2), -300, 200);
    const d1 = predictDisplacement(motion, -300, 200);
    expect(d.dx).toBeCloseTo(2 * d1.dx, 12);
    expect(d.dy).toBeCloseTo(2 * d1.dy, 12);
    expect(d.dz).toBeCloseTo(2 * d1.dz, 12);
  });
});

describe('refuses what it cannot compute', () => {
  const motion = { t: { x: 1, y: 2, z: 3 }, omega: { x: 0.01, y: 0.002, z: -0.003 } };
  it('names the bad field instead of passing NaN through', () => {
    expect(() => predictDisplacement(motion, NaN, 0)).toThrowError(/predictDisplacement: y must be a finite number/);
    expect(() => predictDisplacement(motion, 0, Infinity)).toThrowError(/predictDisplacement: z/);
    expect(() => predictDisplacement({ ...motion, t: { ...motion.t, x: NaN } }, 0, 0)).toThrowError(/predictDisplacement: motion\.t\.x/);
    expect(() => scaleMotion(motion, NaN)).toThrowError(/scaleMotion: factor must be a finite number/);
    expect(() => scaleMotion({ ...motion, omega: { ...motion.omega, z: NaN } }, 2)).toThrowError(/scaleMotion: motion\.omega\.z/);
  });
});
