#pragma once
// A run's outputs commit all or nothing. While an output_transaction is open (the CLI opens one
// per command), every finished temporary (atomic_output, plot::write_figure, atomic_directory) is
// kept aside instead of being renamed; commit() renames them all at the end, with interrupts held
// back, and a transaction destroyed without commit removes them. Without an open transaction
// (library and Python use) each output is renamed as soon as it is finished.
#include <memory>
#include <string>
#include <vector>

#include "tipgap/core/interrupt.hpp"

namespace tipgap {

class output_transaction {
public:
    // inputs: the run's input files; an output on one of them is refused (output_target).
    explicit output_transaction(std::vector<std::string> inputs = {});
    output_transaction(const output_transaction&) = delete;
    output_transaction& operator=(const output_transaction&) = delete;
    ~output_transaction();
    // Renames every finished temporary onto its target, in the order they were finished.
    // Throws tipgap::error (input) naming the user's path when a rename fails.
    void commit();

    struct pending {
        std::string temporary;
        std::string target;     // the resolved target (links written through)
        std::string user_path;  // as the user named it, for messages
        bool directory = false;
    };

private:
    friend std::string output_target(const std::string& path);
    friend void finish_output(pending p);
    std::vector<std::string> inputs_;
    std::vector<std::string> targets_;  // resolved, in this run so far
    std::vector<pending> pending_;
    std::vector<std::unique_ptr<registered_temporary>> registrations_;  // removed on an interrupt
    output_transaction* outer_ = nullptr;
    bool committed_ = false;
};

// Renames p.temporary onto p.target now, or hands it to the open transaction. Throws
// tipgap::error (input) naming p.user_path; the temporary is then removed.
void finish_output(output_transaction::pending p);

// The open transaction, or nullptr.
output_transaction* current_output_transaction();

}  // namespace tipgap
