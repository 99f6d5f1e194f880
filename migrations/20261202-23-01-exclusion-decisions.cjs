"use strict";
/**
 * Each decision the CRO records on an exclusion request, never edited: a correction is a new row
 * that names the row it supersedes and says why. The review keeps the decision in force in its own
 * columns (exclusion_status, decision_reference, decision_date, decided_by) for the engine's reads.
 * Decisions recorded before this table existed are copied in once, as they stand.
 */
const { id, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("exclusion_decisions", {
      id: id(),
      review_id: notNull.ref("exception_reviews", { onDelete: "CASCADE" }),
      decision: notNull.oneOf("approved", "rejected"),
      reference: notNull.varchar(120),
      decided_on: notNull.dateOnly(),
      decided_by: nullable.ref("users"),
      recorded_at: notNull.dateTime(),
      supersedes_id: nullable.ref("exclusion_decisions", { unique: true }),
      correction_reason: nullable.varchar(500),
    });
    await qi.addIndex("exclusion_decisions", ["review_id", "id"], { name: "exclusion_decisions_review" });
    await qi.sequelize.query(
      `INSERT INTO exclusion_decisions (review_id, decision, reference, decided_on, decided_by, recorded_at)
       SELECT id, exclusion_status, COALESCE(decision_reference, ''), decision_date, decided_by, updated_at
         FROM exception_reviews
        WHERE exclusion_status IN ('approved', 'rejected') AND decision_date IS NOT NULL`,
    );
  },

  async down(qi) {
    await qi.dropTable("exclusion_decisions");
  },
};
