"use strict";
/**
 * The overshooting notice's PDF exactly as sent (its sha256 is already kept): the office and the
 * audit can download what the supervisor received.
 */
module.exports = {
  async up(qi, Sequelize) {
    await qi.addColumn("overshooting_notices", "pdf", { type: Sequelize.DataTypes.BLOB("medium"), allowNull: true });
  },

  async down(qi) {
    await qi.removeColumn("overshooting_notices", "pdf");
  },
};
