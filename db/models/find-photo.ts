import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { z } from "zod";
import type { Find } from "./find";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";

/** What the camera wrote, kept in the record (never in the stored image): shown only to roles that may see locations. */
export const photoExifSchema = z.object({
  latitude: z.number().nullable(),
  longitude: z.number().nullable(),
  takenAt: z.string().nullable(),
  camera: z.string().nullable(),
});
export type PhotoExif = z.infer<typeof photoExifSchema>;

/** A photo of a find: the stored image (metadata stripped) and its thumbnail, both objects in the store. */
export class FindPhoto extends Model<InferAttributes<FindPhoto>, InferCreationAttributes<FindPhoto>> {
  declare id: CreationOptional<number>;
  declare findId: ForeignKey<Find["id"]>;
  declare projectId: ForeignKey<Project["id"]>;
  declare objectKey: string;
  declare thumbnailKey: string;
  declare contentType: string;
  declare sizeBytes: number;
  declare thumbnailSizeBytes: number;
  declare widthPx: number;
  declare heightPx: number;
  declare originalFileName: string;
  declare exif: PhotoExif | null;
  declare uploadedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initFindPhoto(sequelize: Sequelize) {
  FindPhoto.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      objectKey: { type: DataTypes.STRING(300), allowNull: false },
      thumbnailKey: { type: DataTypes.STRING(300), allowNull: false },
      contentType: { type: DataTypes.STRING(60), allowNull: false },
      sizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      thumbnailSizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      widthPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      heightPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      originalFileName: { type: DataTypes.STRING(255), allowNull: false },
      exif: jsonColumn("find_photos", "exif", photoExifSchema, { allowNull: true }),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "find_photos", modelName: "FindPhoto", indexes: [{ name: "find_photos_find", fields: ["findId"] }] },
  );
}
