import { Model, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Find } from "./find";
import { photoColumns, type StoredPhotoAttributes } from "./photo-columns";

/** A photo of a find: the stored image (metadata stripped) and its thumbnail, both objects in the store. */
export class FindPhoto extends Model<InferAttributes<FindPhoto>, InferCreationAttributes<FindPhoto>> implements StoredPhotoAttributes {
  declare id: StoredPhotoAttributes["id"];
  declare findId: ForeignKey<Find["id"]>;
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

export function initFindPhoto(sequelize: Sequelize) {
  FindPhoto.init(photoColumns("find_photos"), { sequelize, tableName: "find_photos", modelName: "FindPhoto", indexes: [{ name: "find_photos_find", fields: ["findId"] }] });
}
