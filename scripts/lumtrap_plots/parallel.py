"""Draws independent folders at the same time, one process per core.

Input: a module-level function and its argument tuples. Output: the results
in the order of the arguments. Exceptions (e.g. PlotError) reach the caller
as raised. With one task or one core everything runs in this process.
Processes are forked (Linux), so matplotlib's state is inherited.
"""
from __future__ import annotations

import multiprocessing
import os
from concurrent.futures import ProcessPoolExecutor


def run_all(fn, arg_tuples: list[tuple]) -> list:
    workers = min(len(arg_tuples), len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else 1)
    if workers <= 1:
        return [fn(*a) for a in arg_tuples]
    with ProcessPoolExecutor(max_workers=workers, mp_context=multiprocessing.get_context("fork")) as pool:
        futures = [pool.submit(fn, *a) for a in arg_tuples]
        return [f.result() for f in futures]
