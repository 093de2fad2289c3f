-- Version 7: reserved. The chat branch (button presses, display names) adds its
-- migrations as 0006 and 0007; this file only keeps the numbering without
-- gaps on this branch and is dropped when the branches are merged.
SELECT 1;
