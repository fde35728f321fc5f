ALTER INDEX "samples_ts_brin" SET (autosummarize = true);
