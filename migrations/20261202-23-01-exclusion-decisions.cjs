"use strict";
/**
 * Each decision the CRO records on an exclusion request, never edited: a correction is a new row
 * that names the row it supersedes and says why. The review keeps the decision in force in its own
 * columns (exclusion_status, decision_reference, decision_date, decided_by) for the engine's reads.
 * Decisions recorded before this table existed are copied in once, as they stand.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.createTable("exclusion_decisions", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      review_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: "exception_reviews", key: "id" },
        onDelete: "CASCADE",
      },
      decision: { type: DataTypes.ENUM("approved", "rejected"), allowNull: false },
      reference: { type: DataTypes.STRING(120), allowNull: false },
      decided_on: { type: DataTypes.DATEONLY, allowNull: false },
      decided_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      recorded_at: { type: DataTypes.DATE(3), allowNull: false },
      supersedes_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        unique: true,
        references: { model: "exclusion_decisions", key: "id" },
      },
      correction_reason: { type: DataTypes.STRING(500), allowNull: true },
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
