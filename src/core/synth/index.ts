/** Forward model (synthetic borehole seismic records with known arrivals) and the demo scenario. */
export * from './earth';
export * from '../random';
export * from './pulse';
export * from './synthesize';
export * from './demo';
export * from './text';
