"""The archive: drafts in a database, their bytes in a content-addressed file store."""
