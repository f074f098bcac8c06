// Zoom and pan shared by several images of the same matrix (reconstruction, zero-filled, reference,
// error map and their enlarged copy): one scale and offset, applied to every member as a CSS
// transform. Offsets are percentages of the image box, so boxes of different sizes stay in step.

const minScale = 1;
const maxScale = 32;
/** A press that moves less than this (CSS px) is a click, not a drag. */
const clickSlop = 4;

const clamp = (value, low, high) => Math.min(high, Math.max(low, value));

export class ZoomGroup {
  constructor(onChange = () => {}) {
    this.scale = 1;
    this.x = 0; // offset of the image's left edge, as a fraction of its box
    this.y = 0;
    this.members = new Set();
    this.onChange = onChange;
  }

  add(img) {
    this.members.add(img);
    this.applyTo(img);
  }

  remove(img) {
    this.members.delete(img);
    img.style.transform = '';
  }

  reset() {
    this.set(1, 0, 0);
  }

  /** Zooms by `factor` keeping the point at box fractions (fx, fy) where it is. */
  zoomAt(factor, fx = 0.5, fy = 0.5) {
    const scale = clamp(this.scale * factor, minScale, maxScale);
    const u = (fx - this.x) / this.scale;
    const v = (fy - this.y) / this.scale;
    this.set(scale, fx - scale * u, fy - scale * v);
  }

  /** Moves by (dx, dy) box fractions. */
  panBy(dx, dy) {
    this.set(this.scale, this.x + dx, this.y + dy);
  }

  set(scale, x, y) {
    this.scale = scale;
    // The image always covers its box: no empty margin can be dragged into view.
    this.x = clamp(x, 1 - scale, 0);
    this.y = clamp(y, 1 - scale, 0);
    for (const img of this.members) this.applyTo(img);
    this.onChange(this);
  }

  applyTo(img) {
    img.style.transformOrigin = '0 0';
    img.style.transform =
      this.scale === 1 ? '' : `translate(${this.x * 100}%, ${this.y * 100}%) scale(${this.scale})`;
    img.dataset.zoom = String(this.scale);
  }
}

/**
 * Makes `surface` (the element around an image) steer a group: wheel zooms at the pointer, a drag
 * pans, a click (press without drag) or Enter calls onActivate, and +, −, 0 and the arrows work from
 * the keyboard. `groupOf()` names the group at the time of the event (the dialog switches groups).
 */
export function steerZoom(surface, groupOf, onActivate) {
  // The image's untransformed box in client coordinates (offset* ignore CSS transforms).
  const box = () => {
    const img = surface.querySelector('img');
    const outer = surface.getBoundingClientRect();
    if (!img || img.offsetWidth === 0) return outer;
    return {
      left: outer.left + surface.clientLeft + img.offsetLeft,
      top: outer.top + surface.clientTop + img.offsetTop,
      width: img.offsetWidth,
      height: img.offsetHeight,
    };
  };
  surface.addEventListener(
    'wheel',
    (event) => {
      const group = groupOf();
      // Nothing to zoom (no group, or no image yet): the wheel scrolls the page as usual.
      if (!group || surface.querySelector('img')?.hidden) return;
      event.preventDefault();
      const rect = box();
      const factor = Math.exp(-event.deltaY * 0.0015);
      group.zoomAt(
        factor,
        (event.clientX - rect.left) / rect.width,
        (event.clientY - rect.top) / rect.height,
      );
    },
    { passive: false },
  );
  let press = null;
  surface.addEventListener('pointerdown', (event) => {
    if (event.button !== 0) return;
    press = { x: event.clientX, y: event.clientY, lastX: event.clientX, lastY: event.clientY, moved: false };
    surface.setPointerCapture(event.pointerId);
  });
  surface.addEventListener('pointermove', (event) => {
    if (!press) return;
    if (Math.hypot(event.clientX - press.x, event.clientY - press.y) > clickSlop) press.moved = true;
    if (!press.moved) return;
    const rect = box();
    groupOf()?.panBy((event.clientX - press.lastX) / rect.width, (event.clientY - press.lastY) / rect.height);
    press.lastX = event.clientX;
    press.lastY = event.clientY;
  });
  const release = (event) => {
    if (!press) return;
    const wasClick = !press.moved;
    press = null;
    if (surface.hasPointerCapture(event.pointerId)) surface.releasePointerCapture(event.pointerId);
    if (wasClick && event.type === 'pointerup') onActivate?.();
  };
  surface.addEventListener('pointerup', release);
  surface.addEventListener('pointercancel', release);
  surface.addEventListener('keydown', (event) => {
    const group = groupOf();
    const step = 0.1;
    const keys = {
      Enter: () => onActivate?.(),
      '+': () => group?.zoomAt(1.5),
      '=': () => group?.zoomAt(1.5),
      '-': () => group?.zoomAt(1 / 1.5),
      0: () => group?.reset(),
      ArrowLeft: () => group?.panBy(step, 0),
      ArrowRight: () => group?.panBy(-step, 0),
      ArrowUp: () => group?.panBy(0, step),
      ArrowDown: () => group?.panBy(0, -step),
    };
    const action = keys[event.key];
    if (!action) return;
    event.preventDefault();
    action();
  });
}
