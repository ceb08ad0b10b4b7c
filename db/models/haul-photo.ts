import type { ForeignKey, Sequelize } from "sequelize";
import type { Haul } from "./haul";
import { photoColumns, StoredPhotoModel } from "./photo-columns";

/** A photo of a haul ticket (the scale ticket or the truck's load slip). */
export class HaulPhoto extends StoredPhotoModel<HaulPhoto> {
  declare haulId: ForeignKey<Haul["id"]>;
}

export function initHaulPhoto(sequelize: Sequelize) {
  HaulPhoto.init(photoColumns("haul_photos"), { sequelize, tableName: "haul_photos", modelName: "HaulPhoto", indexes: [{ name: "haul_photos_haul", fields: ["haulId"] }] });
}
