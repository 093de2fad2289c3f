-- Version 4 is reserved for the tamper-evidence work on another branch.
-- This placeholder keeps the numbering without gaps on this branch; when
-- the two branches meet, delete this file and keep the other 0004.
SELECT 1;
