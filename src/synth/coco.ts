import type { Box } from '../image/geometry.js';
import { DETECTOR_CLASSES, type DetectorClass, type Layout } from './layout-model.js';
import type { ScanParams } from './scan-params.js';
import { boxTuple } from '../image/box-tuple.js';
import { scanBox } from './homography.js';

/** COCO object-detection format (cocodataset.org, "Data format": images, annotations with bbox [x,y,width,height]
 *  in pixels from the top-left corner, categories). */
export interface CocoImage {
  id: number;
  file_name: string;
  width: number;
  height: number;
}

export interface CocoAnnotation {
  id: number;
  image_id: number;
  category_id: number;
  bbox: [number, number, number, number];
  area: number;
  iscrowd: 0;
}

export interface CocoDataset {
  info: { description: string; version: string };
  images: CocoImage[];
  annotations: CocoAnnotation[];
  categories: { id: number; name: string; supercategory: string }[];
}

/** Category ids 1..4 in the detector's class order. */
export function cocoCategories(): CocoDataset['categories'] {
  return DETECTOR_CLASSES.map((name, i) => ({ id: i + 1, name, supercategory: 'entry_area' }));
}

/** Smallest box side kept as a label: slivers left after clamping at the page edge carry no signal. */
const MIN_SIDE = 3;

/** Collects the pages and entry-area boxes of one generated set. */
export class CocoBuilder {
  private readonly images: CocoImage[] = [];
  private readonly annotations: CocoAnnotation[] = [];

  addPage(fileName: string, layout: Layout, scan: ScanParams): number {
    return this.addAreas(fileName, layout.fields.flatMap((f) => f.slots), scan);
  }

  /** A page and its entry areas (reference-page boxes with their detector class), mapped through the scan. */
  addAreas(fileName: string, areas: readonly { class: DetectorClass; box: Box }[], scan: ScanParams): number {
    const imageId = this.images.length + 1;
    this.images.push({ id: imageId, file_name: fileName, width: scan.width, height: scan.height });
    for (const area of areas) {
      const b: Box = scanBox(scan.transform, area.box, scan.width, scan.height);
      if (b.w < MIN_SIDE || b.h < MIN_SIDE) continue;
      this.annotations.push({
        id: this.annotations.length + 1,
        image_id: imageId,
        category_id: DETECTOR_CLASSES.indexOf(area.class) + 1,
        bbox: boxTuple(b),
        area: b.w * b.h,
        iscrowd: 0,
      });
    }
    return imageId;
  }

  get annotationCount(): number {
    return this.annotations.length;
  }

  build(description: string): CocoDataset {
    return { info: { description, version: '1' }, images: this.images, annotations: this.annotations, categories: cocoCategories() };
  }
}
