import type { Transaction } from "sequelize";
import type { SurveyQa } from "../../../shared/qa/survey-qa";
import type { PreparedSoundings } from "../../../shared/soundings/prepare";
import { AUDIT_ACTIONS, recordAudit } from "../audit/audit.server";
import { Project, Survey, getSequelize } from "../db.server";
import { ArchivedProjectError } from "../errors";
import type { ImportOptions } from "./import-options";
import { insertSoundings } from "./insert-soundings.server";
import { withProjectLock } from "./project-lock.server";
import { recomputeProjectStatistics } from "../engine/recompute.server";

/**
 * Stores a survey in ONE transaction: the survey row, its soundings (bulk), the recomputed cell
 * results and snapshots of the whole project, and the audit entry. Any failure rolls all of it
 * back, so a file is never half imported.
 */
export interface CommitSurveyInput {
  projectId: number;
  userId: number | null;
  ip?: string | null;
  fileName: string;
  sha256: string;
  options: ImportOptions;
  prepared: PreparedSoundings;
  rowCount: number;
  qa: SurveyQa | null;
  warnings: string[];
  onProgress?: (stage: string, fraction: number) => void;
  /** Runs inside the transaction after the soundings are written (tests use it to interrupt a commit). */
  afterSoundings?: (transaction: Transaction) => Promise<void>;
}

export interface CommittedSurvey {
  surveyId: number;
  rowCount: number;
  soundingCount: number;
  warnings: string[];
  statistics: string | null;
}

export function commitSurvey(input: CommitSurveyInput): Promise<CommittedSurvey> {
  return withProjectLock(input.projectId, () =>
    getSequelize().transaction(async (transaction) => {
      // Row lock on the project: concurrent commits (from any process) queue here, so each
      // recomputation sees every survey committed before it.
      const project = await Project.findByPk(input.projectId, { transaction, lock: transaction.LOCK.UPDATE });
      // An import that was running when its project was archived is refused here, under the lock
      // that archiving waits on, so an archived project never gains a survey.
      if (project?.archivedAt) {
        throw new ArchivedProjectError(
          { message: `${project.name} was archived on ${project.archivedAt.toISOString().slice(0, 10)} while this file was being checked; it is read-only, so the survey was not stored. A site admin can restore it.` },
          { code: "project-archived", archivedAt: project.archivedAt.toISOString() },
        );
      }
      const { options, prepared } = input;
      const survey = await Survey.create(
        {
          projectId: input.projectId,
          kind: options.kind,
          surveyedOn: options.surveyedOn,
          timeZone: options.timeZone,
          waterSurfaceElevation: options.waterSurfaceElevation,
          fileHasElevations: options.fileHasElevations,
          datum: options.datum,
          crs: options.crs,
          lengthUnit: options.lengthUnit,
          fileName: input.fileName,
          contentSha256: input.sha256,
          rowCount: input.rowCount,
          soundingCount: prepared.sourceRow.length,
          uploadedById: input.userId,
          retractedById: null,
          qa: { ...(input.qa ?? {}), warnings: input.warnings, columns: options.columns ?? {}, surveyOrder: options.surveyOrder },
          coverage: input.qa?.coverage ?? null,
          verticalBiasValue: options.verticalBias?.value ?? null,
          verticalBiasUnit: options.verticalBias?.unit ?? null,
          verticalBiasSource: options.verticalBias?.source ?? null,
        },
        { transaction },
      );
      await insertSoundings(getSequelize(), survey.id, prepared, transaction, (fraction) => input.onProgress?.("storing soundings", fraction));
      await input.afterSoundings?.(transaction);
      const outcome = await recomputeProjectStatistics(input.projectId, transaction, {
        extra: {
          id: survey.id,
          kind: options.kind,
          surveyedOn: options.surveyedOn,
          easting: prepared.easting,
          northing: prepared.northing,
          elevation: prepared.elevation,
          refusalElevation: prepared.refusalElevation,
        },
        // The soundings are stored; their arrays go to the engine thread rather than being copied
        // (a 1,000,000-row file: 32 MB less at the commit's peak).
        transferExtra: true,
        onProgress: (stage, fraction) => input.onProgress?.(`computing: ${stage}`, fraction),
      });
      await recordAudit(
        {
          action: AUDIT_ACTIONS.surveyImported,
          projectId: input.projectId,
          userId: input.userId,
          ip: input.ip ?? null,
          detail: { surveyId: survey.id, kind: options.kind, surveyedOn: options.surveyedOn, fileName: input.fileName, rows: input.rowCount, soundings: prepared.sourceRow.length, sha256: input.sha256, ...(options.verticalBias ? { verticalBias: options.verticalBias } : {}) },
        },
        transaction,
      );
      return { surveyId: survey.id, rowCount: input.rowCount, soundingCount: prepared.sourceRow.length, warnings: input.warnings, statistics: outcome.reason };
    }),
  );
}

/** Retracts (soft delete, with a reason) or restores a survey and recomputes the project's statistics in one transaction. */
export function setSurveyStatus(input: {
  projectId: number;
  surveyId: number;
  userId: number;
  ip?: string | null;
  status: "active" | "retracted";
  reason?: string;
}): Promise<Survey | null> {
  return withProjectLock(input.projectId, () =>
    getSequelize().transaction(async (transaction) => {
      await Project.findByPk(input.projectId, { transaction, lock: transaction.LOCK.UPDATE });
      const survey = await Survey.findOne({ where: { id: input.surveyId, projectId: input.projectId }, transaction, lock: transaction.LOCK.UPDATE });
      if (!survey) return null;
      if (survey.status === input.status) return survey;
      if (input.status === "retracted") {
        survey.status = "retracted";
        survey.retractedReason = input.reason ?? "";
        survey.retractedById = input.userId;
        survey.retractedAt = new Date();
      } else {
        survey.status = "active";
        survey.retractedReason = null;
        survey.retractedById = null;
        survey.retractedAt = null;
      }
      await survey.save({ transaction });
      await recomputeProjectStatistics(input.projectId, transaction);
      await recordAudit(
        {
          action: input.status === "retracted" ? AUDIT_ACTIONS.surveyRetracted : AUDIT_ACTIONS.surveyRestored,
          projectId: input.projectId,
          userId: input.userId,
          ip: input.ip ?? null,
          detail: { surveyId: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn, ...(input.reason ? { reason: input.reason } : {}) },
        },
        transaction,
      );
      return survey;
    }),
  );
}
