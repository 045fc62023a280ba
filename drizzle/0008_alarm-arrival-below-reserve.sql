-- Hand-written (replaces what drizzle-kit generated): the alarm kind 'negativeReserve' becomes
-- 'arrivalBelowReserve'. The generated statements dropped and re-created the enum and cast the
-- column back, which fails on stored 'negativeReserve' rows; renaming the value keeps every
-- stored alarm (an arrival below zero is also an arrival below the reserve). The snapshot in
-- meta/ matches the schema either way.
ALTER TYPE "public"."alarm_kind" RENAME VALUE 'negativeReserve' TO 'arrivalBelowReserve';
