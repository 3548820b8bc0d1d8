// Test-only helpers for the survey tests: a deterministic stand-in job with a controllable cost,
// temporary directories, and reading a survey's results without timing fields.
#pragma once

#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <functional>
#include <nlohmann/json.hpp>
#include <string>
#include <thread>
#include <vector>

#include "survey/journal.hpp"
#include "survey/runner.hpp"

namespace arcsieve::survey::testing {

inline bool sanitizer_scale() {
    const char* scale = std::getenv("ARCSIEVE_TEST_SCALE");
    return scale && std::string(scale) == "sanitize";
}

// A stand-in for run_problem: a record that depends only on N (a few values and a padding
// string long enough that a kill can land in the middle of a write), after `sleep_ms`.
inline nlohmann::json stand_in_job(const ProblemSpec& problem, const JobOptions&, int sleep_ms) {
    std::this_thread::sleep_for(std::chrono::milliseconds(sleep_ms));
    const Integer N = *problem.N;
    Integer power;
    mpz_pow_ui(power.get_mpz_t(), N.get_mpz_t(), 40);
    nlohmann::json record;
    record["family"] = problem.family;
    record["N"] = N.get_si();
    record["power40"] = to_string(power);
    record["padding"] = std::string(2000 + 37 * (N.get_ui() % 50), 'x');
    return record;
}

inline JobFunction stand_in(int sleep_ms) {
    return [sleep_ms](const ProblemSpec& p, const JobOptions& o) {
        return stand_in_job(p, o, sleep_ms);
    };
}

struct TemporaryDirectory {
    std::string path;
    explicit TemporaryDirectory(const std::string& name) {
        path = (std::filesystem::temp_directory_path() /
                (name + "-" + std::to_string(::getpid()) + "-" +
                 std::to_string(std::chrono::steady_clock::now().time_since_epoch().count())))
                   .string();
        std::filesystem::create_directories(path);
    }
    ~TemporaryDirectory() {
        std::error_code ignored;
        std::filesystem::remove_all(path, ignored);
    }
};

// results.jsonl without timing: what two runs of the same survey must agree on.
inline std::vector<nlohmann::json> results_without_timing(const std::string& dir) {
    std::vector<nlohmann::json> out;
    for (auto& record : read_journal(dir + "/" + results_file).records) {
        out.push_back(without_timing(record));
    }
    return out;
}

// Runs `body` in a child process (its own process group) and returns its exit status, so that
// TBB is never started in the test process itself (forking after TBB has started is unsafe).
inline int in_subprocess(const std::function<int()>& body) {
    const pid_t pid = ::fork();
    if (pid == 0) {
        ::setpgid(0, 0);
        int code = 99;
        try {
            code = body();
        } catch (...) {
        }
        ::_exit(code);
    }
    int status = 0;
    ::waitpid(pid, &status, 0);
    return WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
}

inline std::vector<ProblemSpec> even_range(int low, int high) {
    return problems_from_range("ratio-sum", std::to_string(low) + ".." + std::to_string(high),
                               Integer(2));
}

}  // namespace arcsieve::survey::testing
