"use strict";
/**
 * Users carry a row version like entities do: an admin's edit sends the version they saw, and a
 * stale one is refused (409), so two admins editing the same user cannot both win. Existing rows
 * start at 1. It is not the token version, which only counts session revocations.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.addColumn("users", "version", { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 });
  },

  async down(qi) {
    await qi.removeColumn("users", "version");
  },
};
