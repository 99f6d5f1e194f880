"use strict";
/**
 * Filings wait for the mail server when it does not answer: a filing is kept as `pending` and
 * sent by the delivery loop once the server is back (server/modules/filings/delivery.ts).
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.addColumn("filings", "delivery", {
      type: DataTypes.ENUM("pending", "sent"),
      allowNull: false,
      defaultValue: "sent",
    });
    await qi.addColumn("filings", "attempts", { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 });
    await qi.addColumn("filings", "last_error", { type: DataTypes.STRING(500), allowNull: true });
    await qi.changeColumn("filings", "message_id", { type: DataTypes.STRING(255), allowNull: true });
    await qi.changeColumn("filings", "sent_at", { type: DataTypes.DATE(3), allowNull: true });
    await qi.addIndex("filings", ["delivery"], { name: "filings_delivery" });
  },

  async down(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.removeIndex("filings", "filings_delivery");
    await qi.sequelize.query("DELETE FROM filings WHERE delivery = 'pending'");
    await qi.changeColumn("filings", "sent_at", { type: DataTypes.DATE(3), allowNull: false });
    await qi.changeColumn("filings", "message_id", { type: DataTypes.STRING(255), allowNull: false });
    await qi.removeColumn("filings", "last_error");
    await qi.removeColumn("filings", "attempts");
    await qi.removeColumn("filings", "delivery");
  },
};
