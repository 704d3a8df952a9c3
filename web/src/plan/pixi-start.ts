/** Starting pixi for the plan view, with the renderer choice explained in one place. */
import { Application } from 'pixi.js';
import { background } from './palette.ts';

/**
 * True when WebGL is backed by a software rasteriser (SwiftShader, llvmpipe). There, 4× MSAA
 * multiplies the cost of every pixel and measured about 2.5× the frame time of the same scene
 * without it (bench/dashboard.bench.ts), so antialiasing is left to GPUs.
 */
export function softwareWebGl(): boolean {
  try {
    const gl = document.createElement('canvas').getContext('webgl');
    if (!gl) return false;
    const info = gl.getExtension('WEBGL_debug_renderer_info');
    const name = String(info ? gl.getParameter(info.UNMASKED_RENDERER_WEBGL) : gl.getParameter(gl.RENDERER));
    gl.getExtension('WEBGL_lose_context')?.loseContext();
    return /swiftshader|llvmpipe|softpipe|software/i.test(name);
  } catch {
    return false;
  }
}

/**
 * WebGL first (SwiftShader when there is no GPU), canvas as the fallback; WebGPU is left out
 * because headless software stacks can advertise it without being able to draw with it. If a
 * WebGL context passes pixi's check but then fails to start, try once more with canvas only.
 */
export async function startPixi(width: number, height: number): Promise<Application> {
  const common = {
    width, height, failIfMajorPerformanceCaveat: false, background, antialias: !softwareWebGl(), autoStart: false,
    // The plan's opaque backdrop texture covers the whole canvas, so clearing first is a wasted pass.
    clearBeforeRender: false,
    resolution: window.devicePixelRatio || 1, autoDensity: true,
  };
  // `?renderer=canvas` forces the fallback, to check it or to work around a bad GPU driver.
  const forced = new URLSearchParams(location.search).get('renderer') === 'canvas';
  const app = new Application();
  try {
    await app.init({ ...common, preference: forced ? ['canvas'] : ['webgl', 'canvas'] });
    return app;
  } catch (first) {
    const fallback = new Application();
    await fallback.init({ ...common, preference: ['canvas'] }).catch(() => { throw first; });
    return fallback;
  }
}
