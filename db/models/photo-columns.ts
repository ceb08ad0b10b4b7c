import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type ModelAttributes } from "sequelize";
import { z } from "zod";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";

/** What the camera wrote, kept in the record (never in the stored image): shown only where the feature allows. */
export const photoExifSchema = z.object({
  latitude: z.number().nullable(),
  longitude: z.number().nullable(),
  takenAt: z.string().nullable(),
  camera: z.string().nullable(),
});
export type PhotoExif = z.infer<typeof photoExifSchema>;

/**
 * The columns every stored photo has, whatever it shows (a find, a jar test, a haul ticket): the
 * image (metadata stripped) and its thumbnail as object keys in the one store, their sizes, the
 * name it was sent under and the camera's data. One declaration, so each photo table reads alike
 * and app/lib/images/stored-photo.server.ts can write any of them.
 */
export interface StoredPhotoAttributes {
  id: CreationOptional<number>;
  projectId: ForeignKey<Project["id"]>;
  objectKey: string;
  thumbnailKey: string;
  contentType: string;
  sizeBytes: number;
  thumbnailSizeBytes: number;
  widthPx: number;
  heightPx: number;
  originalFileName: string;
  exif: PhotoExif | null;
  uploadedById: ForeignKey<User["id"]> | null;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}

/**
 * The model every photo table's model extends: the columns above declared once. A photo model adds
 * only the foreign key of what it shows, and is initialised with `photoColumns`.
 */
export abstract class StoredPhotoModel<M extends StoredPhotoModel<M>> extends Model<InferAttributes<M>, InferCreationAttributes<M>> implements StoredPhotoAttributes {
  declare id: StoredPhotoAttributes["id"];
  declare projectId: StoredPhotoAttributes["projectId"];
  declare objectKey: string;
  declare thumbnailKey: string;
  declare contentType: string;
  declare sizeBytes: number;
  declare thumbnailSizeBytes: number;
  declare widthPx: number;
  declare heightPx: number;
  declare originalFileName: string;
  declare exif: StoredPhotoAttributes["exif"];
  declare uploadedById: StoredPhotoAttributes["uploadedById"];
  declare createdAt: StoredPhotoAttributes["createdAt"];
  declare updatedAt: StoredPhotoAttributes["updatedAt"];
}

export function photoColumns(table: string): ModelAttributes {
  return {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    objectKey: { type: DataTypes.STRING(300), allowNull: false },
    thumbnailKey: { type: DataTypes.STRING(300), allowNull: false },
    contentType: { type: DataTypes.STRING(60), allowNull: false },
    sizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    thumbnailSizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    widthPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    heightPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    originalFileName: { type: DataTypes.STRING(255), allowNull: false },
    exif: jsonColumn(table, "exif", photoExifSchema, { allowNull: true }),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  };
}
