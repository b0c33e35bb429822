import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { z } from 'zod';
import { configError } from '../errors.js';
import type { Box } from '../image/geometry.js';
import { describeIssue } from '../schema/load.js';

/**
 * A labeled detection set in COCO object-detection format (cocodataset.org, "Data format": images with id,
 * file_name, width, height; annotations with image_id, category_id, bbox [x, y, width, height] from the top-left,
 * iscrowd; categories with id and name). Image paths are relative to the JSON file.
 */
const CocoFile = z.object({
  images: z.array(
    z.object({
      id: z.number().int(),
      file_name: z.string().min(1),
      width: z.number().int().positive(),
      height: z.number().int().positive(),
    }),
  ),
  annotations: z.array(
    z.object({
      id: z.number().int().optional(),
      image_id: z.number().int(),
      category_id: z.number().int(),
      bbox: z.tuple([z.number(), z.number(), z.number().nonnegative(), z.number().nonnegative()]),
      iscrowd: z.union([z.literal(0), z.literal(1)]).optional(),
    }),
  ),
  categories: z.array(z.object({ id: z.number().int(), name: z.string().min(1) })).min(1),
});

export interface LabeledImage {
  id: number;
  /** Absolute path of the image file. */
  path: string;
  width: number;
  height: number;
}

export interface LabeledBox {
  imageId: number;
  categoryName: string;
  box: Box;
  crowd: boolean;
}

export interface DetectionDataset {
  /** Absolute path of the COCO JSON file. */
  file: string;
  images: LabeledImage[];
  categoryNames: string[];
  boxes: LabeledBox[];
}

export async function loadCocoDataset(file: string): Promise<DetectionDataset> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw configError(file, code === 'ENOENT' ? 'data file not found' : `cannot read data file (${code ?? 'error'})`, err);
  }
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (err) {
    throw configError(file, `not valid JSON: ${(err as Error).message}`, err);
  }
  const parsed = CocoFile.safeParse(input);
  if (!parsed.success) throw configError(file, `not a COCO detection file: ${describeIssue(parsed.error.issues[0], input)}`);
  const coco = parsed.data;
  const dir = path.dirname(path.resolve(file));

  const imageIds = new Set<number>();
  for (const [i, im] of coco.images.entries()) {
    if (imageIds.has(im.id)) throw configError(file, `images[${i}].id: image id ${im.id} repeats`);
    imageIds.add(im.id);
  }
  const categories = new Map<number, string>();
  for (const [i, c] of coco.categories.entries()) {
    if (categories.has(c.id)) throw configError(file, `categories[${i}].id: category id ${c.id} repeats`);
    if ([...categories.values()].includes(c.name)) throw configError(file, `categories[${i}].name: category "${c.name}" repeats`);
    categories.set(c.id, c.name);
  }
  const boxes: LabeledBox[] = coco.annotations.map((a, i) => {
    if (!imageIds.has(a.image_id)) throw configError(file, `annotations[${i}].image_id: no image with id ${a.image_id}`);
    const categoryName = categories.get(a.category_id);
    if (categoryName === undefined) throw configError(file, `annotations[${i}].category_id: no category with id ${a.category_id}`);
    const [x, y, w, h] = a.bbox;
    return { imageId: a.image_id, categoryName, box: { x, y, w, h }, crowd: a.iscrowd === 1 };
  });
  return {
    file: path.resolve(file),
    images: coco.images.map((im) => ({ id: im.id, path: path.resolve(dir, im.file_name), width: im.width, height: im.height })),
    categoryNames: [...categories.values()],
    boxes,
  };
}
