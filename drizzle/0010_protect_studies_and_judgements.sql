-- Gauge-study evidence and reading judgements were made append-only before the one protecting helper
-- existed (migrations 0004 and 0007); protect them the same way as every other evidence table, so they
-- refuse TRUNCATE too and the evidence-protection test finds them.
SELECT tenthwise_protect_append_only(t::regclass) FROM unnest(ARRAY[
  'gauge_studies', 'gauge_study_parts', 'gauge_study_appraisers', 'gauge_study_values',
  'gauge_study_value_tools', 'gauge_study_results', 'reading_judgements'
]) AS t;
