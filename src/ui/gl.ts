/**
 * Whether WebGL runs on a graphics processor. With a software rasteriser (SwiftShader, llvmpipe: headless
 * browsers, remote desktops, machines without a driver) a large WebGL board draws several times slower
 * than SVG (measured: 300 traces x 4096 samples, see the e2e measurements), so 'auto' uses WebGL only
 * on hardware.
 */
let cached: boolean | null = null;

export function hardwareWebgl(): boolean {
  if (cached !== null) return cached;
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
