// Click an image to see it large: a modal <dialog> with a copy of the image. Result images keep
// zooming and panning together with their small copies; the mask and the PSF get a zoom of their own.

import { byId } from './dom.js';
import { steerZoom, ZoomGroup } from './zoom-group.js';

export class ImageDialog {
  constructor() {
    this.dialog = byId('imageDialog');
    this.img = byId('imageDialogImg');
    this.title = byId('imageDialogTitle');
    this.ownZoom = new ZoomGroup();
    this.group = null;
    steerZoom(byId('imageDialogTile'), () => this.group, null);
    byId('imageDialogClose').addEventListener('click', () => this.dialog.close());
    this.dialog.addEventListener('close', () => this.detach());
    // A click on the backdrop (outside the dialog's box) closes it too.
    this.dialog.addEventListener('click', (event) => {
      const r = this.dialog.getBoundingClientRect();
      const inside =
        event.clientX >= r.left &&
        event.clientX <= r.right &&
        event.clientY >= r.top &&
        event.clientY <= r.bottom;
      if (event.target === this.dialog && !inside) this.dialog.close();
    });
  }

  /** Shows `source` (an <img>) large, titled `title`; `group` is the zoom it follows, if any. */
  open(source, title, group) {
    if (source.hidden || !source.src) return;
    this.detach();
    this.img.src = source.src;
    this.img.alt = source.alt;
    this.title.textContent = title;
    this.dialog.dataset.source = source.id;
    this.group = group ?? this.ownZoom;
    if (!group) this.ownZoom.reset();
    this.group.add(this.img);
    this.dialog.showModal();
  }

  detach() {
    this.group?.remove(this.img);
    this.group = null;
  }
}
