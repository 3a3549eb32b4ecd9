/**
 * Layer velocities never state an sd below the systematic floor: a fit's own sd measures the scatter of
 * its times only, and a line through noise-free times would otherwise claim 0 m/s. The floor is the
 * layered model's model-error share (src/core/velocity/layerMethod.ts LAYER_VS_SD_FLOOR_SHARE), added in
 * quadrature (independent errors add in variance: any statistics text).
 */
import { describe, expect, it } from 'vitest';
import { layerVelocitySdFloorShare, withLayerFloor } from '../../src/core/velocity/layerMethod';

describe('layer velocity sd floor', () => {
  it('is the model-error share on the scale of its last tuning (6% x 0.342 downhole, 6% x 0.301 two receivers, 3% x 0.25 cone; docs/true-vs.md)', () => {
    expect(layerVelocitySdFloorShare('downhole')).toBeCloseTo(0.06 * 0.342, 4);
    expect(layerVelocitySdFloorShare('downhole-pair')).toBeCloseTo(0.06 * 0.301, 4);
    expect(layerVelocitySdFloorShare('seismic-cone')).toBeCloseTo(0.03 * 0.25, 4);
  });

  it('a noise-free fit (own sd 0) states the floor, not zero: 200 m/s downhole', () => {
    const floor = layerVelocitySdFloorShare('downhole') * 200;
    expect(withLayerFloor(0, 200, 'downhole')).toBeCloseTo(floor, 9);
    expect(withLayerFloor(0, 200, 'downhole')).toBeGreaterThan(1);
  });

  it('adds in quadrature: own sd 3 and floor 4 give 5 (3-4-5 triangle)', () => {
    const v = 4 / layerVelocitySdFloorShare('downhole-pair');
    expect(withLayerFloor(3, v, 'downhole-pair')).toBeCloseTo(5, 9);
  });
});
