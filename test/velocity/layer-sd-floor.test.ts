/**
 * Layer velocities never state an sd below the systematic floor: a fit's own sd measures the scatter of
 * its times only, and a line through noise-free times would otherwise claim 0 m/s. The floor is the
 * layered model's model-error share on its calibrated scale (src/core/velocity/layerMethod.ts), added in
 * quadrature (independent errors add in variance: any statistics text).
 */
import { describe, expect, it } from 'vitest';
import { layerVelocitySdFloorShare, withLayerFloor } from '../../src/core/velocity/layerMethod';
import { sdScale } from '../../src/core/velocity/sdCalibration';

describe('layer velocity sd floor', () => {
  it('is the model-error share (6% downhole, 3% cone) times the kind’s layer-model sd scale', () => {
    expect(layerVelocitySdFloorShare('downhole')).toBeCloseTo(0.06 * sdScale('downhole', 'layer-model'), 12);
    expect(layerVelocitySdFloorShare('seismic-cone')).toBeCloseTo(0.03 * sdScale('seismic-cone', 'layer-model'), 12);
    expect(layerVelocitySdFloorShare('downhole')).toBeGreaterThan(0.005);
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
