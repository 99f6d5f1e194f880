"use strict";
/**
 * The sign-in limiter's counts, shared by every server process: one row per limited key (an
 * address or an account) with its failed attempts in the current window and when the window ends.
 * Kept in the database so that N worker processes enforce one limit, not N.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.createTable("sign_in_counts", {
      counter_key: { type: DataTypes.STRING(320), allowNull: false, primaryKey: true },
      hits: { type: DataTypes.INTEGER, allowNull: false },
      reset_at: { type: DataTypes.DATE(3), allowNull: false },
    });
    await qi.addIndex("sign_in_counts", ["reset_at"], { name: "sign_in_counts_reset_at" });
  },

  async down(qi) {
    await qi.dropTable("sign_in_counts");
  },
};
