import { Model, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Haul } from "./haul";
import { photoColumns, type StoredPhotoAttributes } from "./photo-columns";

/** A photo of a haul ticket (the scale ticket or the truck's load slip). */
export class HaulPhoto extends Model<InferAttributes<HaulPhoto>, InferCreationAttributes<HaulPhoto>> implements StoredPhotoAttributes {
  declare id: StoredPhotoAttributes["id"];
  declare haulId: ForeignKey<Haul["id"]>;
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

export function initHaulPhoto(sequelize: Sequelize) {
  HaulPhoto.init(photoColumns("haul_photos"), { sequelize, tableName: "haul_photos", modelName: "HaulPhoto", indexes: [{ name: "haul_photos_haul", fields: ["haulId"] }] });
}
