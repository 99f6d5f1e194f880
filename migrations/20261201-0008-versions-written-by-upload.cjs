"use strict";
/**
 * Who wrote a version and when is a fact of the upload commit that wrote it, not of each row:
 * uploads gain committed_by (committed_at is already there) and observations lose created_by and
 * created_at, which every row of one commit shared. A version's who and when are its upload's
 * (docs/architecture.md#data-model lists observations as portfolio, day, amounts, upload, version). New days are
 * version 1 and current, so those two columns get defaults and the commit's INSERTs name
 * neither for them: about an eighth less work for MariaDB per 100,000-row commit
 * (bench/ingest.bench.ts).
 */
const { now, notNull } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.sequelize.query(
      "ALTER TABLE uploads ADD COLUMN committed_by INT NULL AFTER committed_at, " +
        "ADD CONSTRAINT uploads_committed_by_fk FOREIGN KEY (committed_by) REFERENCES users (id)",
    );
    // The committer of each committed upload: from its rows, else from the audit log, else its uploader.
    await qi.sequelize.query(
      `UPDATE uploads u SET committed_by = COALESCE(
         (SELECT MIN(o.created_by) FROM observations o WHERE o.upload_id = u.id),
         (SELECT MIN(a.actor_user_id) FROM audit_events a WHERE a.action = 'upload.commit' AND a.target = CONCAT('upload #', u.id)),
         u.uploaded_by)
       WHERE u.status = 'committed'`,
    );
    await qi.sequelize.query(
      "ALTER TABLE observations DROP COLUMN created_by, DROP COLUMN created_at, ALTER version SET DEFAULT 1, ALTER is_current SET DEFAULT 1",
    );
  },

  async down(qi) {
    await qi.sequelize.query("ALTER TABLE observations ALTER version DROP DEFAULT, ALTER is_current DROP DEFAULT");
    await qi.addColumn("observations", "created_by", { ...notNull.integer(), defaultValue: 0 });
    await qi.addColumn("observations", "created_at", now());
    await qi.sequelize.query(
      `UPDATE observations o JOIN uploads u ON u.id = o.upload_id
          SET o.created_by = COALESCE(u.committed_by, u.uploaded_by), o.created_at = COALESCE(u.committed_at, u.created_at)`,
    );
    await qi.sequelize.query("ALTER TABLE observations ALTER created_by DROP DEFAULT");
    await qi.sequelize.query("ALTER TABLE uploads DROP FOREIGN KEY uploads_committed_by_fk, DROP COLUMN committed_by");
  },
};
