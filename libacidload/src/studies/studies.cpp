// acidload::studies is filled by the timeline simulation (oil-balance issue).
