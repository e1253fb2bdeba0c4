#include "medload/burden/patient_pass.h"

#include <atomic>
#include <condition_variable>
#include <deque>
#include <exception>
#include <mutex>
#include <thread>

namespace medload {

const Timeline& PassPatient::timeline() {
  if (!timeline_) timeline_ = analysis_.BuildTimeline(history_.dispensings, products_);
  return *timeline_;
}

Burden PassPatient::Evaluate(Date on, std::optional<int> age) {
  if (!matches_) matches_ = MatchRuleRequirements(timeline(), analysis_.tables());
  return analysis_.Evaluate(timeline(), on, age, &*matches_);
}

namespace {

constexpr size_t kPatientsPerBatch = 128;
constexpr size_t kBatches = 4;  // at most this many batches in flight: memory stays bounded

struct Slot {
  PatientHistory history;
  std::vector<const ResolvedProduct*> products;
};

struct Batch {
  std::vector<Slot> slots = std::vector<Slot>(kPatientsPerBatch);
  size_t used = 0;
  bool last = false;  // the reader has finished: nothing follows this batch
};

// A blocking hand-over of batch pointers from one thread to the other.
class Handover {
 public:
  void Put(Batch* batch) {
    {
      std::lock_guard lock(mutex_);
      queue_.push_back(batch);
    }
    ready_.notify_one();
  }
  Batch* Take() {
    std::unique_lock lock(mutex_);
    ready_.wait(lock, [&] { return !queue_.empty(); });
    Batch* batch = queue_.front();
    queue_.pop_front();
    return batch;
  }

 private:
  std::mutex mutex_;
  std::condition_variable ready_;
  std::deque<Batch*> queue_;
};

// Resolves every dispensing's product of the slot's patient, on this (the store's) thread.
void ResolveAll(Slot& slot, Analysis& analysis) {
  slot.products.resize(slot.history.dispensings.size());
  for (size_t i = 0; i < slot.history.dispensings.size(); ++i) {
    slot.products[i] = &analysis.Resolve(slot.history.dispensings[i]);
  }
}

}  // namespace

Status ForEachPatientTimeline(const Store& store, Analysis& analysis, const PassVisit& visit) {
  std::vector<Batch> batches(kBatches);
  Handover to_worker;
  Handover to_reader;
  for (Batch& batch : batches) to_reader.Put(&batch);
  std::atomic<bool> stop{false};
  std::exception_ptr failure;

  std::thread worker([&] {
    for (;;) {
      Batch* batch = to_worker.Take();
      for (size_t i = 0; i < batch->used && !stop.load(std::memory_order_relaxed); ++i) {
        try {
          PassPatient patient(batch->slots[i].history, batch->slots[i].products, analysis);
          if (!visit(patient)) stop = true;
        } catch (...) {
          failure = std::current_exception();
          stop = true;
        }
      }
      const bool last = batch->last;
      to_reader.Put(batch);
      if (last) return;
    }
  });

  Result<PatientCursor> cursor = store.Patients();
  Status status = cursor.ok() ? Status::Ok() : cursor.status();
  Batch* filling = to_reader.Take();
  filling->used = 0;
  filling->last = false;
  while (status.ok() && !stop.load(std::memory_order_relaxed)) {
    Slot& slot = filling->slots[filling->used];
    Result<bool> more = cursor->Next(slot.history);
    if (!more.ok()) status = more.status();
    if (!more.ok() || !*more) break;
    ResolveAll(slot, analysis);
    if (++filling->used == kPatientsPerBatch) {
      to_worker.Put(filling);
      filling = to_reader.Take();
      filling->used = 0;
      filling->last = false;
    }
  }
  filling->last = true;
  to_worker.Put(filling);
  worker.join();
  if (failure) std::rethrow_exception(failure);
  return status;
}

}  // namespace medload
