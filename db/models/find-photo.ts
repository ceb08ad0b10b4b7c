import type { ForeignKey, Sequelize } from "sequelize";
import type { Find } from "./find";
import { photoColumns, StoredPhotoModel } from "./photo-columns";

/** A photo of a find: the stored image (metadata stripped) and its thumbnail, both objects in the store. */
export class FindPhoto extends StoredPhotoModel<FindPhoto> {
  declare findId: ForeignKey<Find["id"]>;
}

export function initFindPhoto(sequelize: Sequelize) {
  FindPhoto.init(photoColumns("find_photos"), { sequelize, tableName: "find_photos", modelName: "FindPhoto", indexes: [{ name: "find_photos_find", fields: ["findId"] }] });
}
