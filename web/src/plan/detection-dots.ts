/**
 * Recent detections as fading dots and the fixed-echo map, in screen space. Dots use two cached
 * textures (a disc for moving returns, a small square for returns the fixed-echo map explains),
 * so shape tells them apart as well as brightness. With WebGL they are particles (one buffer
 * upload per frame for thousands of dots); the canvas renderer gets pooled sprites instead.
 */
import { Container, Graphics, Particle, ParticleContainer, Sprite, type Renderer, type Texture } from 'pixi.js';
import type { DetectionDot, FixedEchoDot } from '../stream/state.ts';
import { detectionColour, fixedEchoColour } from './palette.ts';
import { type View, toScreen } from './view.ts';

export class DetectionDots {
  readonly container = new Container();
  readonly fixedContainer = new Container();
  private readonly fixedGraphics = new Graphics();
  private readonly pool: Sprite[] = [];
  private readonly disc: Texture;
  private readonly square: Texture;
  private readonly particles: { discs: ParticleContainer; squares: ParticleContainer; pool: Particle[] } | null;
  private fixedKey = '';

  constructor(renderer: Renderer, useParticles: boolean) {
    this.disc = renderer.generateTexture(new Graphics().circle(4, 4, 3.2).fill({ color: 0xffffff }));
    this.square = renderer.generateTexture(new Graphics().rect(0, 0, 5, 5).fill({ color: 0xffffff }));
    this.fixedContainer.addChild(this.fixedGraphics);
    if (useParticles) {
      const dynamicProperties = { position: true, color: true, vertex: true, rotation: false, uvs: false };
      const discs = new ParticleContainer({ texture: this.disc, dynamicProperties });
      const squares = new ParticleContainer({ texture: this.square, dynamicProperties });
      this.container.addChild(squares, discs);
      this.particles = { discs, squares, pool: [] };
    } else {
      this.particles = null;
    }
  }

  update(view: View, dots: readonly DetectionDot[], nowS: number, maxAgeS: number, show: boolean): void {
    this.container.visible = show;
    if (!show) return;
    if (this.particles) { this.updateParticles(this.particles, view, dots, nowS, maxAgeS); return; }
    let used = 0;
    for (const d of dots) {
      const look = dotLook(view, d, nowS, maxAgeS);
      if (!look) continue;
      const sprite = this.sprite(used++);
      sprite.texture = d.fixed ? this.square : this.disc;
      sprite.tint = d.fixed ? fixedEchoColour : detectionColour;
      sprite.position.set(look.px, look.py);
      sprite.alpha = look.alpha;
      sprite.scale.set(look.scale);
      sprite.visible = true;
    }
    for (let i = used; i < this.pool.length; i++) this.pool[i].visible = false;
  }

  private updateParticles(
    pc: NonNullable<DetectionDots['particles']>, view: View, dots: readonly DetectionDot[], nowS: number, maxAgeS: number,
  ): void {
    const discs = pc.discs.particleChildren, squares = pc.squares.particleChildren;
    discs.length = 0;
    squares.length = 0;
    let used = 0;
    for (const d of dots) {
      const look = dotLook(view, d, nowS, maxAgeS);
      if (!look) continue;
      let p = pc.pool[used];
      if (!p) p = pc.pool[used] = new Particle({ texture: this.disc, anchorX: 0.5, anchorY: 0.5 });
      used++;
      p.texture = d.fixed ? this.square : this.disc;
      p.x = look.px;
      p.y = look.py;
      p.scaleX = p.scaleY = look.scale;
      p.tint = d.fixed ? fixedEchoColour : detectionColour;
      p.alpha = look.alpha;
      (d.fixed ? squares : discs).push(p);
    }
    pc.discs.update();
    pc.squares.update();
  }

  /** Rebuilt only when the map, the toggle or the view changes; returns whether anything changed. */
  updateFixed(view: View, echoes: readonly FixedEchoDot[], version: number, show: boolean): boolean {
    const toggled = this.fixedContainer.visible !== show;
    this.fixedContainer.visible = show;
    const key = `${version},${view.centreX},${view.centreY},${view.scale},${view.width},${view.height}`;
    if (!show || key === this.fixedKey) return toggled;
    this.fixedKey = key;
    const g = this.fixedGraphics.clear();
    for (const e of echoes) {
      const s = toScreen(view, e.x, e.y);
      g.rect(s.px - 4, s.py - 4, 8, 8);
    }
    g.stroke({ width: 1, color: fixedEchoColour, alpha: 0.45 });
    return true;
  }

  private sprite(i: number): Sprite {
    let s = this.pool[i];
    if (!s) {
      s = new Sprite(this.disc);
      s.anchor.set(0.5);
      this.pool[i] = s;
      this.container.addChild(s);
    }
    return s;
  }
}

/**
 * Where and how a detection dot is drawn, or null when it is too old, from the future, or off
 * screen. Newest dots are bright, old ones fade towards 15 %: age reads from brightness and size.
 * Shared by the sprite (canvas) and particle (WebGL) paths so both look the same.
 */
function dotLook(view: View, d: DetectionDot, nowS: number, maxAgeS: number): { px: number; py: number; alpha: number; scale: number } | null {
  const age = nowS - d.timeS;
  if (age > maxAgeS || age < -0.5) return null;
  const s = toScreen(view, d.x, d.y);
  if (s.px < -10 || s.py < -10 || s.px > view.width + 10 || s.py > view.height + 10) return null;
  const f = 1 - Math.max(0, age) / maxAgeS;
  return { px: s.px, py: s.py, alpha: 0.15 + 0.75 * f, scale: 0.6 + 0.5 * f };
}
