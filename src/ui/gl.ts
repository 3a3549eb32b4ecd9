/**
 * Whether WebGL runs on a graphics processor. With a software rasteriser (SwiftShader, llvmpipe: headless
 * browsers, remote desktops, machines without a driver) a large WebGL board draws several times slower
 * than SVG (measured: 300 traces x 4096 samples, see the e2e measurements), so 'auto' uses WebGL only
 * on hardware.
 */
let cached: boolean | null = null;

export function hardwareWebgl(): boolean {
  if (cached !== null) return cached;
  const t0 = performance.now();
  try {
    return probe();
  } finally {
    // When and how long the check ran (read by the e2e measurements).
    document.documentElement.dataset.webglCheck = `${t0.toFixed(0)}+${(performance.now() - t0).toFixed(0)}`;
  }
}

function probe(): boolean {
  try {
    const canvas = document.createElement('canvas');
    const gl = (canvas.getContext('webgl') ?? canvas.getContext('experimental-webgl')) as WebGLRenderingContext | null;
    if (!gl) return (cached = false);
    const info = gl.getExtension('WEBGL_debug_renderer_info');
    const renderer = String(info ? gl.getParameter(info.UNMASKED_RENDERER_WEBGL) : gl.getParameter(gl.RENDERER));
    cached = !/swiftshader|llvmpipe|software|basic render/i.test(renderer);
    gl.getExtension('WEBGL_lose_context')?.loseContext();
  } catch {
    cached = false;
  }
  return cached;
}

/** Runs the check when the page is idle, so the first large board does not pay for a WebGL context. */
export function warmHardwareWebgl(): void {
  const idle = (globalThis as { requestIdleCallback?: (f: () => void) => number }).requestIdleCallback;
  if (idle) idle(() => void hardwareWebgl());
  else setTimeout(() => void hardwareWebgl(), 500);
}
