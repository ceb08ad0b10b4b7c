import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import { z } from "zod";
import { JAR_CLARITIES } from "../../shared/dewatering/jar-test";
import { jsonColumn } from "./json-column";
import { photoColumns, StoredPhotoModel } from "./photo-columns";
import type { Project } from "./project";
import type { User } from "./user";

/** One dosed jar as stored. */
export const storedJarSchema = z.object({
  doseMgPerL: z.number(),
  settlingMinutes: z.number(),
  turbidityNtu: z.number().nullable(),
  clarity: z.enum(JAR_CLARITIES),
});
export type StoredJar = z.infer<typeof storedJarSchema>;

/**
 * A jar test: the operator's bench check of a polymer dose on the day's slurry: the bench stock
 * and jar size, the raw sample's turbidity, each dosed jar (dose, settling time, clarity, NTU when
 * measured) and the dose chosen for the line.
 */
export class JarTest extends Model<InferAttributes<JarTest>, InferCreationAttributes<JarTest>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare testDate: string;
  declare testTime: string | null;
  declare sampleSource: string;
  declare polymerProduct: string;
  declare polymerLot: string | null;
  declare benchStockPercent: number;
  declare jarVolumeMl: number;
  declare rawTurbidityNtu: number | null;
  declare jars: StoredJar[];
  declare chosenDoseMgPerL: number | null;
  declare notes: string;
  declare idempotencyKey: string | null;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare photos?: NonAttribute<JarTestPhoto[]>;
}

export function initJarTest(sequelize: Sequelize) {
  const measure = (allowNull = false) => ({ type: DataTypes.DOUBLE, allowNull });
  JarTest.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      testDate: { type: DataTypes.DATEONLY, allowNull: false },
      testTime: { type: DataTypes.STRING(5), allowNull: true },
      sampleSource: { type: DataTypes.STRING(200), allowNull: false },
      polymerProduct: { type: DataTypes.STRING(120), allowNull: false },
      polymerLot: { type: DataTypes.STRING(60), allowNull: true },
      benchStockPercent: measure(),
      jarVolumeMl: measure(),
      rawTurbidityNtu: measure(true),
      jars: jsonColumn("jar_tests", "jars", z.array(storedJarSchema)),
      chosenDoseMgPerL: measure(true),
      notes: { type: DataTypes.TEXT, allowNull: false },
      idempotencyKey: { type: DataTypes.STRING(80), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "jar_tests", modelName: "JarTest",
      indexes: [
        { name: "jar_tests_project_day", fields: ["projectId", "testDate"] },
        { name: "jar_tests_idempotency", fields: ["projectId", "idempotencyKey"], unique: true },
      ],
    },
  );
}

/** A photo of a jar test's jars (the raw and the dosed side by side). */
export class JarTestPhoto extends StoredPhotoModel<JarTestPhoto> {
  declare jarTestId: ForeignKey<JarTest["id"]>;
}

export function initJarTestPhoto(sequelize: Sequelize) {
  JarTestPhoto.init(photoColumns("jar_test_photos"), { sequelize, tableName: "jar_test_photos", modelName: "JarTestPhoto", indexes: [{ name: "jar_test_photos_test", fields: ["jarTestId"] }] });
}
