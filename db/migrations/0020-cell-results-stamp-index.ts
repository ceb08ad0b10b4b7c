import type { Migration } from "../umzug";

// The recompute stamp (`max(computedAt)` of a project's cell results) is read by every poll of the
// map and every ETag check; without an index it read all of a project's rows (about 97,000 at a
// 600-acre bay). With (projectId, computedAt) it is one index lookup.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addIndex("cell_results", ["projectId", "computedAt"], { name: "cell_results_project_computed_at" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.removeIndex("cell_results", "cell_results_project_computed_at");
};
