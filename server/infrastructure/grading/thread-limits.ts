// V8 heap limits for the grading threads. A replay keeps one state per event (the timeline a reviewer
// scrubs through), so nearly everything it allocates survives the first young-generation collections;
// with V8's default young generation (16 MB semi-spaces on 64-bit) those survivors are copied again and
// again (tests/bench/model.bench.ts, a 10,000-event replay in a thread: 17 ms median at the default, 11 ms
// at 192 MB, measured 2026-12-02 on this 2-core machine). The young generation only grows to this size under
// such a load; an idle thread keeps V8's small starting size.
import type { ResourceLimits } from 'node:worker_threads'

export const GRADING_THREAD_RESOURCE_LIMITS: ResourceLimits = { maxYoungGenerationSizeMb: 192 }
