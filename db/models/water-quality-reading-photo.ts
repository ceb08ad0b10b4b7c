import type { ForeignKey, Sequelize } from "sequelize";
import { photoColumns, StoredPhotoModel } from "./photo-columns";
import type { WaterQualityReading } from "./water-quality-reading";

/** A photo of a water-quality reading (the sample, the instrument's display, the water at the station). */
export class WaterQualityReadingPhoto extends StoredPhotoModel<WaterQualityReadingPhoto> {
  declare readingId: ForeignKey<WaterQualityReading["id"]>;
}

export function initWaterQualityReadingPhoto(sequelize: Sequelize) {
  WaterQualityReadingPhoto.init(photoColumns("water_quality_reading_photos"), {
    sequelize, tableName: "water_quality_reading_photos", modelName: "WaterQualityReadingPhoto", indexes: [{ name: "water_quality_reading_photos_reading", fields: ["readingId"] }],
  });
}
